! nucleate_sample as a DFT workflow calls it: train a tiny model from two CIF files, sample
! candidates for a formula, and ask again for part of the run, as one job of a job array would.
! Then every other task through nucleate_sample_request, with requests built from
! nucleate_structure_json: de novo, variation and constrained generation from a tiny model with
! generated species, and a crystal-system condition under classifier-free guidance from one more.
! Runs in its own working directory holding an empty structures/ folder (tests/abi/CMakeLists.txt).
! Primitive rock salt NaCl (a = 5.64 A) and CsCl (a = 4.12 A): lattice constants from memory.
! The tiny models are not expected to make good crystals; the checks are of the wrapper's
! contract: counts, species, shapes, finiteness, reproducibility and the constraints asked for.
! Each task's contract is the comment beside its message in schemas/nucleate/v1/sample.proto.
program fortran_sample_test
  use, intrinsic :: iso_c_binding, only: c_double
  use, intrinsic :: ieee_arithmetic, only: ieee_is_finite
  use nucleate
  use abi_test_support
  implicit none
  real(c_double), allocatable :: lattices(:, :, :), frac(:, :), lattices2(:, :, :), frac2(:, :)
  integer, allocatable :: numbers(:), counts(:), space_group(:), numbers2(:), counts2(:)
  integer, allocatable :: space_group2(:)
  logical, allocatable :: valid(:), valid2(:)
  real(c_double), allocatable :: cell_lattices(:, :, :), cell_frac(:, :)
  integer, allocatable :: cell_numbers(:), cell_counts(:)
  integer :: status, k, first, last
  character(len=:), allocatable :: message, nacl, conditioned

  call write_cif('structures/NaCl.cif', 'NaCl', 'Na', 3.98808d0, 60d0)
  call write_cif('structures/CsCl.cif', 'CsCl', 'Cs', 4.12d0, 90d0)
  ! Species given (the composition is fixed), generated species, and a crystal-system condition.
  call train_tiny('train.yaml', '', 'model.nucleate')
  call train_tiny('absorbing.yaml', ', species: absorbing', 'absorbing.nucleate')
  call train_tiny('conditioned.yaml', ', conditions: [crystal_system]', 'conditioned.nucleate')

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

  ! The NaCl cell as the variation and constrained tasks' input, shifted by (0.1, 0.2, 0.3) so
  ! that the fixed atom's coordinates are not exact in binary and must survive the JSON round trip.
  call nucleate_read_structures('structures/NaCl.cif', cell_lattices, cell_frac, cell_numbers, &
                                cell_counts, status, message)
  call expect(status == NUCLEATE_OK .and. size(cell_counts) == 1 .and. size(cell_numbers) == 2, &
              'read the NaCl cell: ' // message)
  if (status /= NUCLEATE_OK .or. size(cell_numbers) /= 2) error stop 1
  cell_frac = modulo(cell_frac + spread([0.1d0, 0.2d0, 0.3d0], 2, 2), 1d0)
  nacl = '{"structure":' // nucleate_structure_json(cell_lattices(:, :, 1), cell_frac, &
         cell_numbers) // '}'

  ! De novo with only sodium allowed: every generated atom is Na (DeNovoTask.allowed_elements),
  ! and no cell is larger than the largest the model saw, 2 atoms (DeNovoTask.max_atoms).
  call nucleate_sample_request('{"model_path":"absorbing.nucleate","de_novo":' // &
                               '{"allowed_elements":[11]},"seed":5,"count":2}', lattices, frac, &
                               numbers, counts, valid, space_group, status, message)
  call expect(status == NUCLEATE_OK, 'de novo status: ' // message)
  call expect(size(counts) == 2 .and. size(lattices, 3) == 2, 'two de novo candidates')
  call expect(all(counts >= 1 .and. counts <= 2), 'one or two atoms in each de novo candidate')
  call expect(size(numbers) == sum(counts) .and. size(frac, 2) == sum(counts), &
              'packed arrays of sum(counts) atoms')
  call expect(size(numbers) > 0 .and. all(numbers == 11), 'every de novo atom is Na')
  call expect(all(ieee_is_finite(lattices)) .and. all(frac >= 0 .and. frac < 1), &
              'finite de novo lattices, coordinates in [0, 1)')

  ! A variation keeps the atoms and their species (VariationTask, vary_species false).
  call nucleate_sample_request('{"model_path":"absorbing.nucleate","variation":{"structure":' // &
                               nacl // ',"strength":0.3},"seed":5,"count":2}', lattices, frac, &
                               numbers, counts, valid, space_group, status, message)
  call expect(status == NUCLEATE_OK, 'variation status: ' // message)
  call expect(size(counts) == 2, 'two variations')
  call expect(all(counts == 2), 'two atoms in each variation')
  if (size(counts) == 2 .and. size(numbers) == 4) then
    do k = 1, 2
      first = 2 * k - 1
      call expect(count(numbers(first:first + 1) == 11) == 1 .and. &
                  count(numbers(first:first + 1) == 17) == 1, 'Na and Cl in variation ' // digit(k))
      call expect(all(ieee_is_finite(lattices(:, :, k))) .and. &
                  abs(determinant(lattices(:, :, k))) > 0, 'a cell with volume, variation ' // &
                  digit(k))
    end do
  end if

  ! Constrained: atom 0 (Na) and the lattice fixed are kept exactly (ConstrainedTask), while Cl
  ! is generated anew.
  call nucleate_sample_request('{"model_path":"absorbing.nucleate","constrained":{"structure":' &
                               // nacl // ',"fixed_atoms":[0],"fix_lattice":true},"seed":5,' // &
                               '"count":2}', lattices, frac, numbers, counts, valid, space_group, &
                               status, message)
  call expect(status == NUCLEATE_OK, 'constrained status: ' // message)
  call expect(size(counts) == 2, 'two constrained candidates')
  call expect(all(counts == 2), 'two atoms in each constrained candidate')
  if (size(counts) == 2 .and. size(numbers) == 4) then
    do k = 1, 2
      first = 2 * k - 1
      call expect(all(lattices(:, :, k) == cell_lattices(:, :, 1)), &
                  'the fixed lattice bit for bit, candidate ' // digit(k))
      call expect(all(frac(:, first) == cell_frac(:, 1)), &
                  'the fixed atom''s coordinates bit for bit, candidate ' // digit(k))
      call expect(all(numbers(first:first + 1) == cell_numbers), &
                  'the given species in order, candidate ' // digit(k))
      call expect(all(frac(:, first + 1) >= 0 .and. frac(:, first + 1) < 1), &
                  'the free atom in [0, 1), candidate ' // digit(k))
    end do
  end if

  ! Classifier-free guidance (Ho and Salimans 2022; SampleConditions.guidance): the prediction is
  ! u + w (c - u), so w = 0 is the unconditional prediction u, which is what a request without
  ! conditions gets (crystal_system 0 = none), and w = 2 moves away from u. One formula unit
  ! only, so the number of atoms drawn cannot depend on the condition either.
  conditioned = '{"model_path":"conditioned.nucleate","composition":{"formula":"NaCl"},' // &
                '"seed":5,"count":2'
  call nucleate_sample_request(conditioned // '}', lattices, frac, numbers, counts, valid, &
                               space_group, status, message)
  call expect(status == NUCLEATE_OK, 'unconditioned status: ' // message)
  call nucleate_sample_request(conditioned // ',"conditions":{"crystal_system":7,' // &
                               '"guidance":0}}', lattices2, frac2, numbers2, counts2, valid2, &
                               space_group2, status, message)
  call expect(status == NUCLEATE_OK, 'guidance 0 status: ' // message)
  call expect(size(counts) == 2 .and. all(counts == 2), 'two candidates of NaCl')
  if (same_shapes()) then
    call expect(all(lattices2 == lattices) .and. all(frac2 == frac) .and. &
                all(numbers2 == numbers) .and. all(counts2 == counts) .and. &
                all(valid2 .eqv. valid) .and. all(space_group2 == space_group), &
                'guidance 0 gives exactly the arrays of no condition')
  else
    call expect(.false., 'guidance 0 and no condition return arrays of the same shapes')
  end if
  call nucleate_sample_request(conditioned // ',"conditions":{"crystal_system":7,' // &
                               '"guidance":2}}', lattices2, frac2, numbers2, counts2, valid2, &
                               space_group2, status, message)
  call expect(status == NUCLEATE_OK, 'guidance 2 status: ' // message)
  if (same_shapes()) then
    call expect(any(lattices2 /= lattices) .or. any(frac2 /= frac), &
                'guidance 2 steers the candidates away from the unconditional ones')
  else
    call expect(.false., 'guidance 2 returns arrays of the same shapes')
  end if

  ! A condition the model was not trained with is refused by field name, with empty arrays.
  call nucleate_sample_request('{"model_path":"absorbing.nucleate","de_novo":{},' // &
                               '"conditions":{"crystal_system":7}}', lattices, frac, numbers, &
                               counts, valid, space_group, status, message)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'a condition the model lacks')
  call expect(index(message, 'conditions.crystal_system') > 0, &
              'the message names conditions.crystal_system: ' // message)
  call expect(size(counts) == 0 .and. size(numbers) == 0 .and. size(lattices, 3) == 0, &
              'no candidates on failure')

  ! gfortran keeps a main program's allocatables to the end; freeing them here leaves
  ! LeakSanitizer (scripts/run-sanitizers.sh) only what the module itself keeps.
  if (allocated(lattices)) deallocate(lattices)
  if (allocated(frac)) deallocate(frac)
  if (allocated(lattices2)) deallocate(lattices2)
  if (allocated(frac2)) deallocate(frac2)
  if (allocated(numbers)) deallocate(numbers)
  if (allocated(counts)) deallocate(counts)
  if (allocated(space_group)) deallocate(space_group)
  if (allocated(numbers2)) deallocate(numbers2)
  if (allocated(counts2)) deallocate(counts2)
  if (allocated(space_group2)) deallocate(space_group2)
  if (allocated(valid)) deallocate(valid)
  if (allocated(valid2)) deallocate(valid2)
  if (allocated(cell_lattices)) deallocate(cell_lattices)
  if (allocated(cell_frac)) deallocate(cell_frac)
  if (allocated(cell_numbers)) deallocate(cell_numbers)
  if (allocated(cell_counts)) deallocate(cell_counts)
  if (allocated(message)) deallocate(message)
  if (allocated(nacl)) deallocate(nacl)
  if (allocated(conditioned)) deallocate(conditioned)

  if (failures > 0) error stop 1
  print '(a)', 'fortran sample test: all checks passed'

contains

  ! Trains a tiny model (2 epochs) on the two cells of structures/; `model_keys` adds keys to the
  ! model section. Stops the test when training fails: nothing after it could run.
  subroutine train_tiny(config_path, model_keys, model_path)
    character(len=*), intent(in) :: config_path, model_keys, model_path
    real(c_double) :: last_loss
    integer :: u, steps_done, epochs_done
    open(newunit=u, file=config_path, status='replace', action='write')
    write(u, '(a)') 'data: {directory: structures}'
    write(u, '(a)') 'split: {validation_fraction: 0.0, test_fraction: 0.0}'
    write(u, '(a)') 'model: {hidden: 16, layers: 1, time_embedding: 8' // model_keys // '}'
    write(u, '(a)') 'diffusion: {steps: 20}'
    write(u, '(a)') 'training: {epochs: 2, batch_size: 2, micro_batch: 1, warmup_steps: 1}'
    write(u, '(a)') 'output: {model: ' // model_path // '}'
    close(u)
    call nucleate_train(config_path, steps_done, epochs_done, last_loss, status, message)
    call expect(status == NUCLEATE_OK, config_path // ' train status: ' // message)
    if (status /= NUCLEATE_OK) error stop 1
  end subroutine

  ! Whether the second set of arrays has the shapes of the first.
  logical function same_shapes()
    same_shapes = size(lattices2, 3) == size(lattices, 3) .and. size(frac2, 2) == size(frac, 2) &
                  .and. size(numbers2) == size(numbers) .and. size(counts2) == size(counts) .and. &
                  size(valid2) == size(valid) .and. size(space_group2) == size(space_group)
  end function

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

end program
