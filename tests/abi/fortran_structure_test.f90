! The structure wrappers of the Fortran module with plain arrays, as a DFT driver calls them.
! Rock salt NaCl, a = 5.64 A (from memory): space group Fm-3m, 225 (International Tables Vol. A),
! nearest Na-Cl distance a/2.
program fortran_structure_test
  use, intrinsic :: iso_c_binding, only: c_double
  use nucleate
  implicit none
  real(c_double), parameter :: a = 5.64d0
  real(c_double) :: lattice(3, 3), frac(3, 8), shifted(3, 8), rotated(3, 3), min_distance, density
  real(c_double) :: rms
  integer :: numbers(8), space_group, status, failures
  logical :: valid, match
  character(len=:), allocatable :: message

  failures = 0
  lattice = 0
  lattice(1, 1) = a
  lattice(2, 2) = a
  lattice(3, 3) = a
  numbers = [11, 11, 11, 11, 17, 17, 17, 17]
  frac = reshape([0d0, 0d0, 0d0,  0d0, .5d0, .5d0,  .5d0, 0d0, .5d0,  .5d0, .5d0, 0d0, &
                  .5d0, .5d0, .5d0,  .5d0, 0d0, 0d0,  0d0, .5d0, 0d0,  0d0, 0d0, .5d0], [3, 8])

  call nucleate_check_structure(lattice, frac, numbers, valid, space_group, min_distance, density, &
                                status, message)
  call expect(status == NUCLEATE_OK, 'check status: ' // message)
  call expect(valid, 'rock salt is valid')
  call expect(space_group == 225, 'rock salt is Fm-3m (225)')
  call expect(abs(min_distance - a / 2) < 1d-9, 'nearest Na-Cl distance is a/2')

  ! The same crystal with its origin shifted and its cell vectors swapped matches.
  shifted = modulo(frac + 0.25d0, 1d0)
  rotated(:, 1) = lattice(:, 2)
  rotated(:, 2) = lattice(:, 1)
  rotated(:, 3) = lattice(:, 3)
  call nucleate_match_structures(lattice, frac, numbers, rotated, shifted, numbers, match, rms, &
                                 status, message)
  call expect(status == NUCLEATE_OK, 'match status: ' // message)
  call expect(match, 'shifted copy matches')
  call expect(rms < 1d-6, 'rms of an exact copy is ~0')

  ! Two atoms on top of each other: checked, found invalid.
  frac(:, 2) = frac(:, 1) + [0.01d0, 0d0, 0d0]
  call nucleate_check_structure(lattice, frac, numbers, valid, space_group, min_distance, density, &
                                status, message)
  call expect(status == NUCLEATE_OK, 'overlap check status: ' // message)
  call expect(.not. valid, 'overlapping atoms are invalid')

  ! A lattice holding NaN is a defect of the candidate: checked and found invalid, no crash.
  lattice(1, 1) = ieee_nan()
  call nucleate_check_structure(lattice, frac, numbers, valid, space_group, min_distance, density, &
                                status, message)
  call expect(status == NUCLEATE_OK, 'NaN lattice is checked: ' // message)
  call expect(.not. valid, 'NaN lattice is invalid')

  ! An atomic number outside 1..118 too.
  lattice(1, 1) = a
  numbers(1) = 0
  call nucleate_check_structure(lattice, frac, numbers, valid, space_group, min_distance, density, &
                                status, message)
  call expect(status == NUCLEATE_OK .and. .not. valid, 'atomic number 0 is invalid: ' // message)

  ! Atoms and coordinates that disagree in number: the structure cannot be read at all.
  numbers(1) = 11
  call nucleate_check_structure(lattice, frac(:, 1:7), numbers, valid, space_group, min_distance, &
                                density, status, message)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'size mismatch is refused')
  call expect(index(message, 'frac_coords') > 0, 'and the message names frac_coords: ' // message)

  if (failures > 0) error stop 'fortran_structure_test failed'
  print '(a)', 'fortran_structure_test: all passed'

contains

  subroutine expect(condition, what)
    logical, intent(in) :: condition
    character(len=*), intent(in) :: what
    if (.not. condition) then
      failures = failures + 1
      print '(2a)', 'FAILED: ', what
    end if
  end subroutine

  function ieee_nan() result(x)
    use, intrinsic :: ieee_arithmetic, only: ieee_value, ieee_quiet_nan
    real(c_double) :: x
    x = ieee_value(x, ieee_quiet_nan)
  end function

end program fortran_structure_test
