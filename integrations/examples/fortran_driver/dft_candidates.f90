! dft_candidates: the first step of a DFT workflow. Reads a job file, asks nucleate for candidate
! cells of one composition, keeps those that pass every validity rule, and writes each as a block
! of cell vectors and Cartesian positions in angstrom, ready to paste into a DFT input.
!
!   dft_candidates JOB_FILE
!
! The job file is a Fortran namelist; model and formula are required, the rest show defaults.
! Paths are relative to the folder the driver runs in.
!   &job
!     model = 'model.nucleate'     ! a model file written by nucleate train
!     formula = 'NaCl'
!     formula_units = 1            ! formula units per cell
!     count = 10                   ! candidates asked for
!     seed = 0                     ! candidate k is sample first_index + k - 1 of this seed's
!     first_index = 0              ! stream: the same cell whatever count (0 .. 2^31-1 each)
!     output_prefix = 'candidates' ! the blocks go to <output_prefix>.cells
!   /
!
! <output_prefix>.cells opens with comment lines saying that candidates are hypotheses, then has
! one block per accepted candidate:
!   ! candidate 3 of seed 7: 2 atoms, space group 1
!   ! toxic: Tl                     (only when flagged; likewise "! radioactive: ...")
!   CELL_PARAMETERS angstrom
!     a_x a_y a_z                   (one cell vector per line: a, b, c)
!   ATOMIC_POSITIONS angstrom
!   Na  x y z                       (element symbol, Cartesian position)
! Element symbols and Cartesian positions are the library's own: each accepted cell is written
! as extended XYZ by nucleate (nucleate_structure_text) and read back here.
program dft_candidates
  use, intrinsic :: iso_c_binding, only: c_double
  use, intrinsic :: iso_fortran_env, only: error_unit
  use nucleate
  implicit none

  character(len=1024) :: model = '', output_prefix = 'candidates'
  character(len=256) :: formula = ''
  integer :: formula_units = 1, count = 10, seed = 0, first_index = 0
  namelist /job/ model, formula, formula_units, count, seed, first_index, output_prefix

  character(len=1024) :: job_file
  character(len=:), allocatable :: message, output_path
  real(c_double), allocatable :: lattices(:, :, :), frac(:, :)
  integer, allocatable :: numbers(:), counts(:), space_group(:)
  logical, allocatable :: valid(:)
  integer :: status, unit, k, first, accepted

  if (command_argument_count() /= 1) then
    write(error_unit, '(a)') 'usage: dft_candidates JOB_FILE  (a namelist &job ... /; ' // &
                             'see the source)'
    error stop 2
  end if
  call get_command_argument(1, job_file)
  call read_job(trim(job_file))

  call nucleate_sample(trim(model), trim(formula), formula_units, formula_units, count, seed, &
                       first_index, lattices, frac, numbers, counts, valid, space_group, status, &
                       message)
  if (status /= NUCLEATE_OK) call stop_with('nucleate_sample: ' // message)

  output_path = trim(output_prefix) // '.cells'
  open(newunit=unit, file=output_path, status='replace', action='write', iostat=status)
  if (status /= 0) call stop_with('cannot write ' // output_path)
  write(unit, '(a)') '! Candidate structures from a statistical model (nucleate), for ' // &
                     trim(formula) // ', seed ' // text_of(seed) // '.'
  write(unit, '(a)') '! They are hypotheses, not predictions of stable compounds: relax and ' // &
                     'check them with DFT before use,'
  write(unit, '(a)') '! and follow local safety rules and licensed practice for any element ' // &
                     'flagged toxic or radioactive.'
  accepted = 0
  first = 1
  do k = 1, size(counts)
    if (valid(k)) then
      call write_block(unit, first_index + k - 1, lattices(:, :, k), &
                       frac(:, first:first + counts(k) - 1), numbers(first:first + counts(k) - 1), &
                       space_group(k))
      accepted = accepted + 1
    end if
    first = first + counts(k)
  end do
  close(unit)
  write(*, '(a)') 'dft_candidates: ' // text_of(count) // ' asked, ' // &
                  text_of(size(pack(counts, counts > 0))) // ' finished, ' // text_of(accepted) // &
                  ' valid, written to ' // output_path

contains

  ! Reads the namelist and checks every value before any work.
  subroutine read_job(path)
    character(len=*), intent(in) :: path
    character(len=512) :: io_message
    integer :: job_unit, io
    open(newunit=job_unit, file=path, status='old', action='read', iostat=io, iomsg=io_message)
    if (io /= 0) call stop_with(path // ': ' // trim(io_message))
    read(job_unit, nml=job, iostat=io, iomsg=io_message)
    close(job_unit)
    if (io /= 0) call stop_with(path // ': cannot read the namelist &job: ' // trim(io_message))
    if (len_trim(model) == 0) call stop_with(path // ': model is required')
    if (len_trim(formula) == 0) call stop_with(path // ': formula is required')
    if (formula_units < 1) call stop_with(path // ': formula_units must be >= 1, got ' // &
                                          text_of(formula_units))
    if (count < 1) call stop_with(path // ': count must be >= 1, got ' // text_of(count))
    if (seed < 0) call stop_with(path // ': seed must be >= 0, got ' // text_of(seed))
    if (first_index < 0) call stop_with(path // ': first_index must be >= 0, got ' // &
                                        text_of(first_index))
    if (len_trim(output_prefix) == 0) call stop_with(path // ': output_prefix must not be blank')
  end subroutine

  ! One candidate as a block. The library writes the cell as extended XYZ (symbols and Cartesian
  ! positions); the atom lines are its lines 3 .. 2 + atoms.
  subroutine write_block(out, sample_index, lattice, cell_frac, cell_numbers, group)
    integer, intent(in) :: out, sample_index, group
    real(c_double), intent(in) :: lattice(3, 3), cell_frac(:, :)
    integer, intent(in) :: cell_numbers(:)
    character(len=:), allocatable :: xyz, line, toxic, radioactive
    character(len=8) :: symbol
    real(c_double) :: position(3)
    integer :: i, start, newline, io, atoms
    call nucleate_structure_text(lattice, cell_frac, cell_numbers, 'extxyz', xyz, status, message)
    if (status /= NUCLEATE_OK) call stop_with('nucleate_structure_text: ' // message)
    call nucleate_element_flags(lattice, cell_frac, cell_numbers, toxic, radioactive, status, &
                                message)
    if (status /= NUCLEATE_OK) call stop_with('nucleate_element_flags: ' // message)
    write(out, '(a)') ''
    write(out, '(a)') '! candidate ' // text_of(sample_index) // ' of seed ' // text_of(seed) // &
                      ': ' // text_of(size(cell_numbers)) // ' atoms, space group ' // &
                      text_of(group)
    if (len(toxic) > 0) write(out, '(a)') '! toxic: ' // toxic
    if (len(radioactive) > 0) write(out, '(a)') '! radioactive: ' // radioactive
    write(out, '(a)') 'CELL_PARAMETERS angstrom'
    do i = 1, 3
      write(out, '(3f20.12)') lattice(:, i)
    end do
    write(out, '(a)') 'ATOMIC_POSITIONS angstrom'
    start = 1
    atoms = 0
    do i = 1, 2 + size(cell_numbers)
      newline = index_of_newline(xyz, start)
      line = xyz(start:newline - 1)
      start = newline + 1
      if (i <= 2) cycle  ! the atom count and the comment line
      read(line, *, iostat=io) symbol, position
      if (io /= 0) call stop_with('cannot read the atom line "' // line // '" of candidate ' // &
                                  text_of(sample_index))
      write(out, '(a2, 3f20.12)') symbol, position
      atoms = atoms + 1
    end do
    if (atoms /= size(cell_numbers)) call stop_with('candidate ' // text_of(sample_index) // &
                                                    ': the extended XYZ text has too few atoms')
  end subroutine

  ! The position of the next newline at or after `start`, or one past the end.
  integer function index_of_newline(text, start)
    character(len=*), intent(in) :: text
    integer, intent(in) :: start
    index_of_newline = index(text(start:), achar(10))
    if (index_of_newline == 0) then
      index_of_newline = len(text) + 1
    else
      index_of_newline = start + index_of_newline - 1
    end if
  end function

  function text_of(value) result(text)
    integer, intent(in) :: value
    character(len=:), allocatable :: text
    character(len=16) :: buffer
    write(buffer, '(i0)') value
    text = trim(buffer)
  end function

  subroutine stop_with(what)
    character(len=*), intent(in) :: what
    write(error_unit, '(a)') 'dft_candidates: ' // what
    error stop 1
  end subroutine

end program
