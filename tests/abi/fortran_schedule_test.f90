! A Fortran DFT driver's view of libnucleate: only `use nucleate`, no C. Built against the build
! tree and again against the installed module (tests/consumers).
program fortran_schedule_test
  use, intrinsic :: iso_c_binding, only: c_double
  use nucleate
  implicit none

  ! Ho et al. 2020, "Denoising Diffusion Probabilistic Models", section 4: linear betas from
  ! 1e-4 to 0.02 over T = 1000 steps.
  real(c_double), parameter :: ho_beta_start = 1.0d-4, ho_beta_end = 0.02d0
  real(c_double), parameter :: tolerance = 1.0d-15
  real(c_double), allocatable :: beta(:), alpha_bar(:), log_snr(:), sigma(:)
  character(len=:), allocatable :: message, version
  integer :: status, passed, failed

  passed = 0
  failed = 0

  version = nucleate_version()
  call check(len(version) > 0, 'nucleate_version is not empty')

  call nucleate_variance_schedule('linear', 1000, beta, alpha_bar, log_snr, status, message)
  call check(status == NUCLEATE_OK, 'linear: status OK ' // message)
  call check(size(beta) == 1000 .and. size(alpha_bar) == 1000 .and. size(log_snr) == 1000, &
             'linear: 1000 rows')
  if (size(beta) == 1000) then
    call check(abs(beta(1) - ho_beta_start) <= tolerance, 'linear: beta(1) = 1e-4')
    call check(abs(beta(1000) - ho_beta_end) <= tolerance, 'linear: beta(1000) = 0.02')
    call check(all(alpha_bar(2:) < alpha_bar(:999)), 'linear: alpha_bar decreasing')
    call check(all(log_snr(2:) < log_snr(:999)), 'linear: log_snr decreasing')
  end if

  ! Nichol and Dhariwal 2021, section 3.2: the cosine schedule drives alpha_bar(T) near zero
  ! (below 1e-3 with the default offset s = 0.008 and beta clipped at 0.999).
  call nucleate_variance_schedule('cosine', 1000, beta, alpha_bar, log_snr, status, message)
  call check(status == NUCLEATE_OK, 'cosine: status OK ' // message)
  call check(size(alpha_bar) == 1000, 'cosine: 1000 rows')
  if (size(alpha_bar) == 1000) then
    call check(alpha_bar(1000) < 1.0d-3, 'cosine: alpha_bar(1000) < 1e-3')
    call check(all(alpha_bar(2:) < alpha_bar(:999)), 'cosine: alpha_bar decreasing')
  end if

  call nucleate_variance_schedule('linear', 0, beta, alpha_bar, log_snr, status, message)
  call check(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'steps = 0: INVALID_ARGUMENT')
  call check(index(message, 'steps') > 0, 'steps = 0: message names steps: ' // message)
  call check(size(beta) == 0, 'steps = 0: no rows')

  call nucleate_sigma_schedule(10, 0.01d0, 0.5d0, sigma, status, message)
  call check(status == NUCLEATE_OK, 'sigma: status OK ' // message)
  call check(size(sigma) == 10, 'sigma: 10 levels')
  if (size(sigma) == 10) then
    call check(abs(sigma(1) - 0.01d0) <= tolerance, 'sigma: sigma(1) = sigma_min')
    call check(abs(sigma(10) - 0.5d0) <= tolerance, 'sigma: sigma(10) = sigma_max')
    call check(all(sigma(2:) > sigma(:9)), 'sigma: increasing')
  end if

  ! gfortran keeps a main program's allocatables to the end; freeing them here leaves
  ! LeakSanitizer (scripts/run-sanitizers.sh) only what the module itself keeps.
  if (allocated(beta)) deallocate(beta)
  if (allocated(alpha_bar)) deallocate(alpha_bar)
  if (allocated(log_snr)) deallocate(log_snr)
  if (allocated(sigma)) deallocate(sigma)
  if (allocated(message)) deallocate(message)
  if (allocated(version)) deallocate(version)

  print '(I0, A, I0, A)', passed, ' passed, ', failed, ' failed'
  if (failed /= 0 .or. passed == 0) error stop 1

contains

  subroutine check(condition, what)
    logical, intent(in) :: condition
    character(len=*), intent(in) :: what
    if (condition) then
      passed = passed + 1
    else
      failed = failed + 1
      write(*, '(A, A)') 'check failed: ', what
    end if
  end subroutine

end program fortran_schedule_test
