! The conformance suite from Fortran through module nucleate (nucleate_call_json). Fortran has no
! portable directory listing, so CMake writes the case names into a list file at configure time.
! Usage: run_conformance_fortran CASES_DIR CASES_LIST
program run_conformance
  use nucleate, only: nucleate_call_json, NUCLEATE_OK
  implicit none

  character(len=4096) :: cases_dir, list_file, line
  integer :: list_unit, io, passed, failed

  if (command_argument_count() /= 2) then
    write(*, '(A)') 'usage: run_conformance_fortran CASES_DIR CASES_LIST'
    error stop 2
  end if
  call get_command_argument(1, cases_dir)
  call get_command_argument(2, list_file)

  passed = 0
  failed = 0
  open(newunit=list_unit, file=trim(list_file), status='old', action='read', iostat=io)
  if (io /= 0) then
    write(*, '(A, A)') 'cannot open ', trim(list_file)
    error stop 1
  end if
  do
    read(list_unit, '(A)', iostat=io) line
    if (io /= 0) exit
    if (len_trim(line) == 0) cycle
    if (run_case(trim(cases_dir) // '/' // trim(line), trim(line))) then
      passed = passed + 1
    else
      failed = failed + 1
    end if
  end do
  close(list_unit)

  print '(I0, A, I0, A)', passed, ' passed, ', failed, ' failed'
  if (failed /= 0 .or. passed == 0) error stop 1

contains

  ! The whole file as one string (stream access keeps every byte, newlines included).
  subroutine read_whole(path, text, ok)
    character(len=*), intent(in) :: path
    character(len=:), allocatable, intent(out) :: text
    logical, intent(out) :: ok
    integer :: file_unit, size_bytes, io_status
    ok = .false.
    inquire(file=path, size=size_bytes)
    if (size_bytes < 0) size_bytes = 0  ! a missing file: the open below fails
    allocate(character(len=size_bytes) :: text)
    open(newunit=file_unit, file=path, access='stream', form='unformatted', status='old', &
         action='read', iostat=io_status)
    if (io_status /= 0) return
    if (size_bytes > 0) read(file_unit, iostat=io_status) text
    close(file_unit)
    ok = io_status == 0
  end subroutine

  pure function without_final_newline(text) result(out)
    character(len=*), intent(in) :: text
    character(len=:), allocatable :: out
    out = text
    if (len(out) > 0) then
      if (out(len(out):len(out)) == new_line('a')) out = out(:len(out) - 1)
    end if
  end function

  ! Replies are long single lines: show where they part, with some context on both sides.
  subroutine print_difference(name, got, expected)
    character(len=*), intent(in) :: name, got, expected
    integer :: at, from
    at = 1
    do while (at <= min(len(got), len(expected)))
      if (got(at:at) /= expected(at:at)) exit
      at = at + 1
    end do
    from = max(1, at - 40)
    write(*, '(A, A, A, I0)') 'FAIL ', name, ': reply differs at byte ', at - 1
    write(*, '(A, A)') '  got:      ...', got(from:min(len(got), from + 79))
    write(*, '(A, A)') '  expected: ...', expected(from:min(len(expected), from + 79))
  end subroutine

  logical function run_case(folder, name)
    character(len=*), intent(in) :: folder, name
    character(len=:), allocatable :: method, request, status_text, expected, reply, message
    logical :: ok(4)
    integer :: expected_status, status, io_status
    run_case = .false.
    call read_whole(folder // '/method', method, ok(1))
    call read_whole(folder // '/request.json', request, ok(2))
    call read_whole(folder // '/expected_status', status_text, ok(3))
    call read_whole(folder // '/expected_reply.json', expected, ok(4))
    if (.not. all(ok)) then
      write(*, '(A, A, A)') 'FAIL ', name, ': a case file is missing'
      return
    end if
    read(status_text, *, iostat=io_status) expected_status
    if (io_status /= 0) then
      write(*, '(A, A, A)') 'FAIL ', name, ': expected_status is not an integer'
      return
    end if
    method = trim(adjustl(without_final_newline(method)))

    call nucleate_call_json(method, request, reply, status, message)
    if (status /= expected_status) then
      write(*, '(A, A, A, I0, A, I0, A, A)') 'FAIL ', name, ': status ', status, ', expected ', &
        expected_status, ' ', message
    else if (without_final_newline(reply) /= without_final_newline(expected) .or. &
             len(without_final_newline(reply)) /= len(without_final_newline(expected))) then
      ! Fortran /= pads the shorter string with blanks, so the lengths are compared as well.
      call print_difference(name, without_final_newline(reply), without_final_newline(expected))
    else if (status /= NUCLEATE_OK .and. (len(message) == 0 .or. &
             index(message, new_line('a')) > 0)) then
      write(*, '(A, A, A, A)') 'FAIL ', name, ': the message is not one non-empty line: ', message
    else
      run_case = .true.
    end if
  end function

end program run_conformance
