! What the Fortran model and sampling tests share: a failure counter with its check, and a small CIF writer.
module abi_test_support
  use, intrinsic :: iso_c_binding, only: c_double
  implicit none
  private
  public :: failures, expect, write_cif

  integer :: failures = 0

contains

  ! Counts and prints a failed check; the program stops with an error at the end if any failed.
  subroutine expect(condition, what)
    logical, intent(in) :: condition
    character(len=*), intent(in) :: what
    if (.not. condition) then
      failures = failures + 1
      print '(2a)', 'FAILED: ', what
    end if
  end subroutine

  ! A P1 CIF of a two-atom cell with equal axes a and equal angles: the cation at the origin,
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

end module
