! The structure wrappers of the Fortran module with plain arrays, as a DFT driver calls them.
! Rock salt NaCl, a = 5.64 A (from memory): space group Fm-3m, 225 (International Tables Vol. A),
! nearest Na-Cl distance a/2.
program fortran_structure_test
  use, intrinsic :: iso_c_binding, only: c_double
  use nucleate
  implicit none
  real(c_double), parameter :: a = 5.64d0
  real(c_double) :: lattice(3, 3), frac(3, 8), shifted(3, 8), rotated(3, 3), min_distance, density
  real(c_double) :: rms, lattices(3, 3, 3), all_frac(3, 18)
  real(c_double), allocatable :: read_lattices(:, :, :), read_frac(:, :)
  integer, allocatable :: read_numbers(:), read_counts(:), group(:)
  logical, allocatable :: representative(:)
  integer :: numbers(8), all_numbers(18), space_group, status, failures, unit
  logical :: valid, match
  character(len=:), allocatable :: message, text, toxic, radioactive

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

  ! Dedup: rock salt, its shifted copy, and CsCl (a = 4.12 A, from memory): two groups.
  lattices(:, :, 1) = lattice
  lattices(:, :, 2) = rotated
  lattices(:, :, 3) = 0
  lattices(1, 1, 3) = 4.12d0
  lattices(2, 2, 3) = 4.12d0
  lattices(3, 3, 3) = 4.12d0
  all_frac(:, 1:8) = frac
  all_frac(:, 9:16) = shifted
  all_frac(:, 17) = 0
  all_frac(:, 18) = 0.5d0
  all_numbers = [numbers, numbers, 55, 17]
  call nucleate_dedup_structures(lattices, all_frac, all_numbers, [8, 8, 2], group, &
                                 representative, status, message)
  call expect(status == NUCLEATE_OK, 'dedup status: ' // message)
  call expect(all(group == [1, 1, 2]), 'rock salt and its copy share a group, CsCl has its own')
  call expect(all(representative .eqv. [.true., .false., .true.]), 'representatives')

  ! A CIF with two data blocks read into arrays.
  open(newunit=unit, file='fortran_structure_test.cif', status='replace', action='write')
  write(unit, '(a)') 'data_CsCl', '_cell_length_a 4.12', '_cell_length_b 4.12', &
    '_cell_length_c 4.12', '_cell_angle_alpha 90', '_cell_angle_beta 90', '_cell_angle_gamma 90', &
    'loop_', '_symmetry_equiv_pos_as_xyz', 'x,y,z', 'loop_', '_atom_site_label', &
    '_atom_site_fract_x', '_atom_site_fract_y', '_atom_site_fract_z', 'Cs1 0 0 0', &
    'Cl1 0.5 0.5 0.5', 'data_Po', '_cell_length_a 3.35', '_cell_length_b 3.35', &
    '_cell_length_c 3.35', '_cell_angle_alpha 90', '_cell_angle_beta 90', '_cell_angle_gamma 90', &
    'loop_', '_symmetry_equiv_pos_as_xyz', 'x,y,z', 'loop_', '_atom_site_label', &
    '_atom_site_fract_x', '_atom_site_fract_y', '_atom_site_fract_z', 'Po1 0 0 0'
  close(unit)
  call nucleate_read_structures('fortran_structure_test.cif', read_lattices, read_frac, &
                                read_numbers, read_counts, status, message)
  call expect(status == NUCLEATE_OK, 'read status: ' // message)
  call expect(size(read_counts) == 2, 'two structures read')
  if (size(read_counts) == 2) then
    call expect(all(read_counts == [2, 1]), 'with 2 and 1 atoms')
    call expect(all(read_numbers == [55, 17, 84]), 'Cs, Cl and Po')
    call expect(abs(read_lattices(1, 1, 1) - 4.12d0) < 1d-9, 'CsCl cell edge')
    call expect(abs(read_frac(2, 2) - 0.5d0) < 1d-12, 'Cl at the body centre')
  end if
  call nucleate_read_structures('no_such_file.cif', read_lattices, read_frac, read_numbers, &
                                read_counts, status, message)
  call expect(status == NUCLEATE_ERROR_IO, 'a missing file is an I/O error: ' // message)

  ! The library writes a structure as a file's text. Extended XYZ: the comment line's Lattice= holds
  ! the cell vectors a, b, c and each atom line the symbol and the Cartesian position, frac times
  ! the cell vectors (common practice, no source); Na at (0, 1/2, 1/2) is at (0, a/2, a/2).
  call nucleate_structure_text(lattice, frac, numbers, 'extxyz', text, status, message)
  call expect(status == NUCLEATE_OK, 'extxyz status: ' // message)
  call expect(index(text, '8' // achar(10)) == 1, 'extxyz starts with the atom count: ' // text)
  call expect(index(text, 'Lattice="5.64 0 0 0 5.64 0 0 0 5.64"') > 0, &
              'the cell in Lattice="..." (quotes decoded from the JSON reply): ' // text)
  call expect(index(text, achar(10) // 'Na 0 2.82 2.82' // achar(10)) > 0, &
              'the second Na at (0, a/2, a/2) angstrom: ' // text)
  call expect(index(text, achar(10) // 'Cl 2.82 2.82 2.82' // achar(10)) > 0, &
              'the first Cl at the cell centre: ' // text)
  call nucleate_structure_text(lattice, frac, numbers, 'cif', text, status, message)
  call expect(status == NUCLEATE_OK .and. index(text, 'data_') > 0 .and. &
              index(text, '_cell_length_a') > 0, 'a CIF data block: ' // message)
  call nucleate_structure_text(lattice, frac, numbers, 'pdb', text, status, message)
  call expect(status == NUCLEATE_ERROR_INVALID_ARGUMENT .and. len(text) == 0, 'an unknown format')
  call expect(index(message, 'pdb') > 0, 'the message names the format: ' // message)

  ! Element flags from the library's tables: none for NaCl; polonium (from the CIF above) has no
  ! stable isotope (common practice, no source); thallium and uranium in one invented cell: Tl is
  ! flagged toxic by the criterion written in core/elements/elements.cc (its salts are restricted
  ! by name as poisons, from memory), U is radioactive (no stable isotope, common practice).
  call nucleate_element_flags(lattice, frac, numbers, toxic, radioactive, status, message)
  call expect(status == NUCLEATE_OK .and. len(toxic) == 0 .and. len(radioactive) == 0, &
              'no flags for NaCl: ' // message // toxic // radioactive)
  if (size(read_counts) == 2) then
    call nucleate_element_flags(read_lattices(:, :, 2), read_frac(:, 3:3), read_numbers(3:3), &
                                toxic, radioactive, status, message)
    call expect(status == NUCLEATE_OK .and. radioactive == 'Po' .and. len(toxic) == 0, &
                'Po is radioactive: ' // message // radioactive)
  end if
  call nucleate_element_flags(lattice, frac(:, 1:2), [81, 92], toxic, radioactive, status, message)
  call expect(status == NUCLEATE_OK .and. toxic == 'Tl' .and. radioactive == 'U', &
              'Tl toxic and U radioactive: ' // message // ' ' // toxic // ' ' // radioactive)
  call nucleate_element_flags(lattice, frac(:, 1:2), [81, 82], toxic, radioactive, status, message)
  call expect(toxic == 'Tl,Pb' .or. toxic == 'Pb,Tl', 'Tl and Pb both flagged toxic (EU RoHS ' // &
              'Directive 2011/65/EU Annex II restricts lead, from memory): ' // toxic)

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

  ! gfortran keeps a main program's allocatables to the end; freeing them here leaves
  ! LeakSanitizer (scripts/run-sanitizers.sh) only what the module itself keeps.
  if (allocated(read_lattices)) deallocate(read_lattices)
  if (allocated(read_frac)) deallocate(read_frac)
  if (allocated(read_numbers)) deallocate(read_numbers)
  if (allocated(read_counts)) deallocate(read_counts)
  if (allocated(group)) deallocate(group)
  if (allocated(representative)) deallocate(representative)
  if (allocated(message)) deallocate(message)
  if (allocated(text)) deallocate(text)
  if (allocated(toxic)) deallocate(toxic)
  if (allocated(radioactive)) deallocate(radioactive)

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
