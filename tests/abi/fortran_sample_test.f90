! nucleate_sample as a DFT workflow calls it: train a tiny model from two CIF files, sample
! candidates for a formula, and ask again for part of the run, as one job of a job array would.
! Runs in its own working directory holding an empty structures/ folder (tests/abi/CMakeLists.txt).
! Primitive rock salt NaCl (a = 5.64 A) and CsCl (a = 4.12 A): lattice constants from memory.
! The tiny model is not expected to make good crystals; the checks are of the wrapper's contract:
! counts, species, shapes, finiteness and reproducibility.
program fortran_sample_test
  use, intrinsic :: iso_c_binding, only: c_double
  use, intrinsic :: ieee_arithmetic, only: ieee_is_finite
  use nucleate
  implicit none
  real(c_double), allocatable :: lattices(:, :, :), frac(:, :), lattices2(:, :, :), frac2(:, :)
  integer, allocatable :: numbers(:), counts(:), space_group(:), numbers2(:), counts2(:)
  integer, allocatable :: space_group2(:)
  logical, allocatable :: valid(:), valid2(:)
  real(c_double) :: last_loss
  integer :: status, failures, steps_done, epochs_done, unit, k, first, last
  character(len=:), allocatable :: message

  failures = 0
  call write_cif('structures/NaCl.cif', 'NaCl', 'Na', 3.98808d0, 60d0)
  call write_cif('structures/CsCl.cif', 'CsCl', 'Cs', 4.12d0, 90d0)
  open(newunit=unit, file='train.yaml', status='replace', action='write')
  write(unit, '(a)') 'data: {directory: structures}'
  write(unit, '(a)') 'split: {validation_fraction: 0.0, test_fraction: 0.0}'
  write(unit, '(a)') 'model: {hidden: 16, layers: 1, time_embedding: 8}'
  write(unit, '(a)') 'diffusion: {steps: 20}'
  write(unit, '(a)') 'training: {epochs: 2, batch_size: 2, micro_batch: 1, warmup_steps: 1}'
  write(unit, '(a)') 'output: {model: model.nucleate}'
  close(unit)
  call nucleate_train('train.yaml', steps_done, epochs_done, last_loss, status, message)
  call expect(status == NUCLEATE_OK, 'train status: ' // message)
  if (status /= NUCLEATE_OK) error stop 1

  ! Four formula units of NaCl: 8 atoms per cell, 4 Na (Z = 11) and 4 Cl (Z = 17).
  call nucleate_sample('model.nucleate', 'NaCl', 4, 4, 3, 5, 0, lattices, frac, numbers, counts, &
                       valid, space_group, status, message)
  call expect(status == NUCLEATE_OK, 'sample status: ' // message)
  call expect(size(counts) == 3 .and. size(lattices, 3) == 3 .and. size(valid) == 3 .and. &
              size(space_group) == 3, 'three candidates')
  call expect(all(counts == 8), 'eight atoms in each candidate')
  call expect(size(numbers) == 24 .and. size(frac, 2) == 24, 'packed arrays of 3 x 8 atoms')
  if (size(counts) == 3 .and. size(numbers) == 24) then
    do k = 1, 3
      first = 8 * (k - 1) + 1
      last = first + 7
      call expect(count(numbers(first:last) == 11) == 4, 'four Na in candidate ' // digit(k))
      call expect(count(numbers(first:last) == 17) == 4, 'four Cl in candidate ' // digit(k))
      call expect(all(ieee_is_finite(lattices(:, :, k))), 'a finite lattice, candidate ' // digit(k))
      call expect(abs(determinant(lattices(:, :, k))) > 0, 'a cell with volume, candidate ' // &
                  digit(k))
      call expect(all(frac(:, first:last) >= 0 .and. frac(:, first:last) < 1), &
                  'fractional coordinates in [0, 1), candidate ' // digit(k))
      call expect(space_group(k) >= 0 .and. space_group(k) <= 230, &
                  'a space-group number or 0, candidate ' // digit(k))
    end do
  end if

  ! Samples 1 and 2 again, asked for on their own: the same bytes (DESIGN.md, "Randomness").
  call nucleate_sample('model.nucleate', 'NaCl', 4, 4, 2, 5, 1, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message)
  call expect(status == NUCLEATE_OK, 'split sample status: ' // message)
  call expect(size(counts2) == 2, 'two candidates')
  if (size(counts2) == 2 .and. size(numbers2) == 16 .and. size(numbers) == 24) then
    call expect(all(lattices2 == lattices(:, :, 2:3)), 'the same lattices when split')
    call expect(all(frac2 == frac(:, 9:24)), 'the same coordinates when split')
    call expect(all(numbers2 == numbers(9:24)), 'the same species when split')
    call expect(all(valid2 .eqv. valid(2:3)), 'the same verdicts when split')
    call expect(all(space_group2 == space_group(2:3)), 'the same space groups when split')
  else
    call expect(.false., 'the split call returned 2 candidates of 8 atoms')
  end if

  ! The optional sampler settings reach the library: DDIM over 5 of the 20 steps runs, and more
  ! steps than the model has are refused by name.
  call nucleate_sample('model.nucleate', 'NaCl', 1, 2, 2, 5, 0, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message, sampler='ddim', steps=5)
  call expect(status == NUCLEATE_OK, 'DDIM status: ' // message)
  call expect(size(counts2) == 2, 'two DDIM candidates')
  call expect(all(counts2 == 2 .or. counts2 == 4), 'one or two formula units of NaCl')
  call nucleate_sample('model.nucleate', 'NaCl', 1, 1, 1, 5, 0, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message, steps=50)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, '50 steps of a 20-step model')
  call expect(index(message, 'sampler.steps') > 0, 'the message names sampler.steps: ' // message)
  call nucleate_sample('model.nucleate', 'NaCl', 1, 1, 1, 5, 0, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message, sampler='euler')
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'an unknown sampler name')
  call expect(index(message, 'euler') > 0, 'the message names the sampler: ' // message)
  call expect(size(counts2) == 0, 'no candidates on failure')

  ! Potassium is not in the model's vocabulary (Na, Cs, Cl).
  call nucleate_sample('model.nucleate', 'KCl', 1, 1, 1, 5, 0, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'an element outside the vocabulary')
  call expect(index(message, 'composition.formula') > 0, 'the message names the field: ' // message)
  call nucleate_sample('model.nucleate', 'NaCl', 1, 1, 1, -1, 0, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'a negative seed')
  call expect(index(message, 'seed') > 0, 'the message names the seed: ' // message)
  call nucleate_sample('missing.nucleate', 'NaCl', 1, 1, 1, 5, 0, lattices2, frac2, numbers2, &
                       counts2, valid2, space_group2, status, message)
  call expect(status == NUCLEATE_ERROR_IO, 'a missing model file is an I/O error')

  if (failures > 0) error stop 1
  print '(a)', 'fortran sample test: all checks passed'

contains

  ! A P1 CIF of a two-atom cell with equal axes a and equal angles: atom 1 at the origin,
  ! Cl at (1/2, 1/2, 1/2).
  subroutine write_cif(path, name, cation, a, angle)
    character(len=*), intent(in) :: path, name, cation
    real(c_double), intent(in) :: a, angle
    integer :: u
    open(newunit=u, file=path, status='replace', action='write')
    write(u, '(a)') 'data_' // name
    write(u, '(a, f10.5)') '_cell_length_a ', a
    write(u, '(a, f10.5)') '_cell_length_b ', a
    write(u, '(a, f10.5)') '_cell_length_c ', a
    write(u, '(a, f10.5)') '_cell_angle_alpha ', angle
    write(u, '(a, f10.5)') '_cell_angle_beta ', angle
    write(u, '(a, f10.5)') '_cell_angle_gamma ', angle
    write(u, '(a)') 'loop_'
    write(u, '(a)') '_atom_site_label'
    write(u, '(a)') '_atom_site_type_symbol'
    write(u, '(a)') '_atom_site_fract_x'
    write(u, '(a)') '_atom_site_fract_y'
    write(u, '(a)') '_atom_site_fract_z'
    write(u, '(a)') cation // '1 ' // cation // ' 0 0 0'
    write(u, '(a)') 'Cl1 Cl 0.5 0.5 0.5'
    close(u)
  end subroutine

  ! The signed volume spanned by the columns a, b, c: a . (b x c).
  pure function determinant(m) result(d)
    real(c_double), intent(in) :: m(3, 3)
    real(c_double) :: d
    d = m(1, 1) * (m(2, 2) * m(3, 3) - m(3, 2) * m(2, 3)) &
      - m(1, 2) * (m(2, 1) * m(3, 3) - m(3, 1) * m(2, 3)) &
      + m(1, 3) * (m(2, 1) * m(3, 2) - m(3, 1) * m(2, 2))
  end function

  function digit(k) result(text)
    integer, intent(in) :: k
    character(len=1) :: text
    write(text, '(i1)') k
  end function

  subroutine expect(condition, what)
    logical, intent(in) :: condition
    character(len=*), intent(in) :: what
    if (.not. condition) then
      print '(a)', 'FAILED: ' // what
      failures = failures + 1
    end if
  end subroutine

end program
