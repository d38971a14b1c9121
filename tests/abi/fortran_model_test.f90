! The model wrappers of the Fortran module, as a DFT workflow calls them: train a tiny model from
! a folder of CIF files, check the model file, evaluate the denoiser on one cell. Runs in its own
! working directory holding an empty structures/ folder (tests/abi/CMakeLists.txt).
! Primitive rock salt NaCl (a = 5.64 A) and CsCl (a = 4.12 A): lattice constants from memory.
program fortran_model_test
  use, intrinsic :: iso_c_binding, only: c_double
  use nucleate
  use abi_test_support
  implicit none
  real(c_double) :: lattice(3, 3), frac(3, 2), score(3, 2), lattice_noise(6), last_loss
  integer :: status, steps_done, epochs_done, parameters, unit
  character(len=:), allocatable :: message

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
  call expect(steps_done == 2, 'two cells, batches of two, two epochs: two steps')
  call expect(epochs_done == 2, 'two epochs done')
  call expect(last_loss > 0, 'a positive loss')

  call nucleate_model_parameters('model.nucleate', parameters, status, message)
  call expect(status == NUCLEATE_OK, 'model info status: ' // message)
  call expect(parameters > 1000, 'the model has its parameters')

  lattice = 0
  lattice(:, 1) = [0d0, 2.82d0, 2.82d0]
  lattice(:, 2) = [2.82d0, 0d0, 2.82d0]
  lattice(:, 3) = [2.82d0, 2.82d0, 0d0]
  frac = reshape([0d0, 0d0, 0d0, .5d0, .5d0, .5d0], [3, 2])
  call nucleate_evaluate('model.nucleate', lattice, frac, [11, 17], 5, score, lattice_noise, &
                         status, message)
  call expect(status == NUCLEATE_OK, 'evaluate status: ' // message)
  call expect(maxval(abs(sum(score, dim=2))) < 1d-4 * max(1d0, maxval(abs(score))), &
              'the score is mean-free')
  call expect(any(lattice_noise /= 0), 'a lattice noise prediction')

  call nucleate_evaluate('model.nucleate', lattice, frac, [11, 26], 5, score, lattice_noise, &
                         status, message)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT, 'iron is not in the vocabulary')
  call expect(index(message, 'atomic_numbers[1]') > 0, 'the message names the atom: ' // message)
  call nucleate_model_parameters('missing.nucleate', parameters, status, message)
  call expect(status == NUCLEATE_ERROR_IO, 'a missing model file is an I/O error')
  call nucleate_train('missing.yaml', steps_done, epochs_done, last_loss, status, message)
  call expect(status == NUCLEATE_ERROR_IO, 'a missing configuration is an I/O error')

  ! gfortran keeps a main program's allocatables to the end; freeing them here leaves
  ! LeakSanitizer (scripts/run-sanitizers.sh) only what the module itself keeps.
  if (allocated(message)) deallocate(message)

  if (failures > 0) error stop 1
  print '(a)', 'fortran model test: all checks passed'

end program
