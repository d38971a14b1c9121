! nucleate: Fortran 2003 interface to libnucleate (iso_c_binding).
!
! Every procedure returns an integer status (NUCLEATE_OK = 0 on success) and, on failure, an
! allocatable message naming what was wrong. Results come back in allocatable arrays and
! strings: the module copies what the library returned and frees the library's memory itself,
! so Fortran code never frees C memory.
!
! Requests and replies are protobuf JSON (see schemas/nucleate/v1 in the source tree); the typed
! wrappers below build the request and read the reply for you.
!
! Structures as plain arrays, in angstrom: lattice(:, i) is cell vector i (a, b, c) in Cartesian
! coordinates; frac(:, j) the fractional coordinates of atom j; numbers(j) its atomic number.
module nucleate
  use, intrinsic :: iso_c_binding, only: c_char, c_int32_t, c_size_t, c_double, c_ptr, &
    c_null_ptr, c_null_char, c_associated, c_f_pointer, c_loc
  implicit none
  private

  ! Status codes: the same numbers as nucleate.h; never renumbered.
  integer, parameter, public :: NUCLEATE_OK = 0
  integer, parameter, public :: NUCLEATE_ERROR_UNKNOWN_METHOD = 1
  integer, parameter, public :: NUCLEATE_ERROR_BAD_ENCODING = 2
  integer, parameter, public :: NUCLEATE_ERROR_MALFORMED_REQUEST = 3
  integer, parameter, public :: NUCLEATE_ERROR_INVALID_ARGUMENT = 4
  integer, parameter, public :: NUCLEATE_ERROR_LIMIT_EXCEEDED = 5
  integer, parameter, public :: NUCLEATE_ERROR_OUT_OF_MEMORY = 6
  integer, parameter, public :: NUCLEATE_ERROR_INTERNAL = 7
  integer, parameter, public :: NUCLEATE_ERROR_NULL_ARGUMENT = 8
  integer, parameter, public :: NUCLEATE_ERROR_IO = 9
  integer, parameter, public :: NUCLEATE_ERROR_CANCELLED = 10
  integer, parameter, public :: NUCLEATE_ERROR_NUMERICAL = 11
  integer, parameter, public :: NUCLEATE_ERROR_UNSUPPORTED = 12
  integer, parameter, public :: NUCLEATE_ERROR_COLLECTIVE = 13

  integer(c_int32_t), parameter :: ENCODING_JSON = 1

  public :: nucleate_version, nucleate_call_json, nucleate_reply_reals
  public :: nucleate_variance_schedule, nucleate_sigma_schedule
  public :: nucleate_check_structure, nucleate_match_structures, nucleate_dedup_structures
  public :: nucleate_read_structures, nucleate_structure_json, nucleate_structure_text
  public :: nucleate_element_flags
  public :: nucleate_train, nucleate_model_parameters, nucleate_evaluate, nucleate_sample
  public :: nucleate_sample_request

  interface
    function c_version() bind(C, name="nucleate_version") result(text)
      import :: c_ptr
      type(c_ptr) :: text
    end function

    function c_call(method, request, request_size, encoding, reply, reply_size, message) &
        bind(C, name="nucleate_call") result(status)
      import :: c_char, c_size_t, c_int32_t, c_ptr
      character(kind=c_char), dimension(*), intent(in) :: method
      character(kind=c_char), dimension(*), intent(in) :: request
      integer(c_size_t), value :: request_size
      integer(c_int32_t), value :: encoding
      type(c_ptr), intent(out) :: reply
      integer(c_size_t), intent(out) :: reply_size
      type(c_ptr), intent(out) :: message
      integer(c_int32_t) :: status
    end function

    function c_reply_doubles(method, reply, reply_size, encoding, path, values, count, message) &
        bind(C, name="nucleate_reply_doubles") result(status)
      import :: c_char, c_size_t, c_int32_t, c_ptr
      character(kind=c_char), dimension(*), intent(in) :: method
      character(kind=c_char), dimension(*), intent(in) :: reply
      integer(c_size_t), value :: reply_size
      integer(c_int32_t), value :: encoding
      character(kind=c_char), dimension(*), intent(in) :: path
      type(c_ptr), intent(out) :: values
      integer(c_size_t), intent(out) :: count
      type(c_ptr), intent(out) :: message
      integer(c_int32_t) :: status
    end function

    subroutine c_free(pointer) bind(C, name="nucleate_free")
      import :: c_ptr
      type(c_ptr), value :: pointer
    end subroutine

    function c_strlen(text) bind(C, name="strlen") result(length)
      import :: c_ptr, c_size_t
      type(c_ptr), value :: text
      integer(c_size_t) :: length
    end function
  end interface

contains

  ! Copies `length` characters from C memory into a Fortran string (does not free).
  function copy_chars(text, length) result(out)
    type(c_ptr), intent(in) :: text
    integer(c_size_t), intent(in) :: length
    character(len=:), allocatable :: out
    character(kind=c_char), pointer :: chars(:)
    integer :: i
    allocate(character(len=length) :: out)
    if (length == 0) return
    call c_f_pointer(text, chars, [length])
    do i = 1, int(length)
      out(i:i) = chars(i)
    end do
  end function

  ! Takes a library-owned NUL-terminated message: copies it, frees it.
  subroutine take_message(text, message)
    type(c_ptr), intent(in) :: text
    character(len=:), allocatable, intent(out) :: message
    if (c_associated(text)) then
      message = copy_chars(text, c_strlen(text))
      call c_free(text)
    else
      message = ''
    end if
  end subroutine

  !> The run-time library version, "major.minor.patch".
  function nucleate_version() result(version)
    character(len=:), allocatable :: version
    type(c_ptr) :: text
    text = c_version()
    version = copy_chars(text, c_strlen(text))  ! static string: not freed
  end function

  !> Calls `method` with a protobuf JSON request. On success status = NUCLEATE_OK and `reply`
  !> holds the JSON reply; otherwise `message` says what was wrong and `reply` holds the JSON
  !> error detail.
  subroutine nucleate_call_json(method, request, reply, status, message)
    character(len=*), intent(in) :: method, request
    character(len=:), allocatable, intent(out) :: reply
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    type(c_ptr) :: reply_ptr, message_ptr
    integer(c_size_t) :: reply_size
    status = c_call(method // c_null_char, request, int(len(request), c_size_t), ENCODING_JSON, &
                    reply_ptr, reply_size, message_ptr)
    if (status == NUCLEATE_ERROR_NULL_ARGUMENT .and. .not. c_associated(reply_ptr)) then
      reply = ''
    else
      reply = copy_chars(reply_ptr, reply_size)
      call c_free(reply_ptr)
    end if
    call take_message(message_ptr, message)
  end subroutine

  !> Every number at `path` (proto field names joined by dots, e.g. "variance_steps.alpha_bar")
  !> in a JSON reply of `method`.
  subroutine nucleate_reply_reals(method, reply, path, values, status, message)
    character(len=*), intent(in) :: method, reply, path
    real(c_double), allocatable, intent(out) :: values(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    type(c_ptr) :: values_ptr, message_ptr
    integer(c_size_t) :: count
    real(c_double), pointer :: found(:)
    values_ptr = c_null_ptr
    count = 0
    status = c_reply_doubles(method // c_null_char, reply, int(len(reply), c_size_t), &
                             ENCODING_JSON, path // c_null_char, values_ptr, count, message_ptr)
    if (status == NUCLEATE_OK) then
      allocate(values(count))
      if (count > 0) then
        call c_f_pointer(values_ptr, found, [count])
        values = found
        call c_free(values_ptr)
      end if
      message = ''
    else
      allocate(values(0))
      call take_message(message_ptr, message)
    end if
  end subroutine

  ! A double as protobuf JSON: enough digits to read back exactly; non-finite values as the quoted
  ! names protobuf JSON uses, so the library can name the field that holds them.
  function json_real(value) result(text)
    use, intrinsic :: ieee_arithmetic, only: ieee_is_nan, ieee_is_finite
    real(c_double), intent(in) :: value
    character(len=:), allocatable :: text
    character(len=40) :: buffer
    if (ieee_is_nan(value)) then
      text = '"NaN"'
    else if (.not. ieee_is_finite(value)) then
      text = merge('"Infinity" ', '"-Infinity"', value > 0)
      text = trim(text)
    else
      write(buffer, '(ES25.17E3)') value
      text = trim(adjustl(buffer))
    end if
  end function

  function json_int(value) result(text)
    integer, intent(in) :: value
    character(len=:), allocatable :: text
    character(len=24) :: buffer
    write(buffer, '(I0)') value
    text = trim(buffer)
  end function

  ! Calls Schedule and reads the named columns of the rows.
  subroutine schedule_columns(request, rows, columns, table, status, message)
    character(len=*), intent(in) :: request, rows
    character(len=*), intent(in) :: columns(:)
    real(c_double), allocatable, intent(out) :: table(:, :)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    real(c_double), allocatable :: column(:)
    integer :: c
    allocate(table(0, size(columns)))
    call nucleate_call_json('Schedule', request, reply, status, message)
    if (status /= NUCLEATE_OK) return
    do c = 1, size(columns)
      call nucleate_reply_reals('Schedule', reply, rows // '.' // trim(columns(c)), column, &
                                status, message)
      if (status /= NUCLEATE_OK) return
      if (c == 1) then
        deallocate(table)
        allocate(table(size(column), size(columns)))
      end if
      table(:, c) = column
    end do
  end subroutine

  !> A variance-preserving schedule of `kind` ("linear", "cosine", "sigmoid", "log_snr_linear")
  !> with `steps` steps and the library's default parameters. Returns beta, alpha_bar and
  !> log_snr for t = 1..steps.
  subroutine nucleate_variance_schedule(kind, steps, beta, alpha_bar, log_snr, status, message)
    character(len=*), intent(in) :: kind
    integer, intent(in) :: steps
    real(c_double), allocatable, intent(out) :: beta(:), alpha_bar(:), log_snr(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    real(c_double), allocatable :: table(:, :)
    character(len=9), parameter :: columns(3) = [character(len=9) :: 'beta', 'alpha_bar', 'log_snr']
    call schedule_columns('{"variance":{"kind":"VARIANCE_KIND_' // upper(kind) // &
                          '","steps":' // json_int(steps) // '}}', 'variance_steps', columns, &
                          table, status, message)
    beta = table(:, 1)
    alpha_bar = table(:, 2)
    log_snr = table(:, 3)
  end subroutine

  !> A geometric sigma ladder for fractional coordinates from sigma_min to sigma_max.
  subroutine nucleate_sigma_schedule(steps, sigma_min, sigma_max, sigma, status, message)
    integer, intent(in) :: steps
    real(c_double), intent(in) :: sigma_min, sigma_max
    real(c_double), allocatable, intent(out) :: sigma(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    real(c_double), allocatable :: table(:, :)
    character(len=5), parameter :: columns(1) = ['sigma']
    call schedule_columns('{"sigma":{"kind":"SIGMA_KIND_GEOMETRIC","steps":' // json_int(steps) &
                          // ',"sigma_min":' // json_real(sigma_min) // ',"sigma_max":' // &
                          json_real(sigma_max) // '}}', 'sigma_levels', columns, table, status, &
                          message)
    sigma = table(:, 1)
  end subroutine

  !> One structure as the JSON of a nucleate.v1.Structure message, for requests built by hand
  !> (e.g. a SampleRequest for nucleate_sample_request): lattice(:, i) is cell vector i (a, b, c)
  !> in Cartesian angstrom, frac(:, j) the fractional coordinates of atom j and numbers(j) its
  !> atomic number. Fields of type StructureInput take it as {"structure": <this>}. Numbers are
  !> written with 18 significant digits, so the library reads back exactly the doubles given.
  function nucleate_structure_json(lattice, frac, numbers) result(text)
    real(c_double), intent(in) :: lattice(3, 3), frac(:, :)
    integer, intent(in) :: numbers(:)
    character(len=:), allocatable :: text
    integer :: i, j
    text = '{"lattice":['
    do i = 1, 3
      do j = 1, 3
        text = text // json_real(lattice(j, i))
        if (i < 3 .or. j < 3) text = text // ','
      end do
    end do
    text = text // '],"atomic_numbers":['
    do j = 1, size(numbers)
      text = text // json_int(numbers(j))
      if (j < size(numbers)) text = text // ','
    end do
    text = text // '],"frac_coords":['
    do j = 1, size(frac, 2)
      do i = 1, 3
        text = text // json_real(frac(i, j))
        if (j < size(frac, 2) .or. i < 3) text = text // ','
      end do
    end do
    text = text // ']}'
  end function

  ! One number at `path` of a reply.
  subroutine reply_real(method, reply, path, value, status, message)
    character(len=*), intent(in) :: method, reply, path
    real(c_double), intent(out) :: value
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    real(c_double), allocatable :: values(:)
    value = 0
    call nucleate_reply_reals(method, reply, path, values, status, message)
    if (status /= NUCLEATE_OK) return
    if (size(values) /= 1) then
      status = NUCLEATE_ERROR_INTERNAL
      message = 'nucleate: expected one value at ' // path
      return
    end if
    value = values(1)
  end subroutine

  !> Checks one structure with the default thresholds: valid (no problem found), the space-group
  !> number at 0.1 angstrom (0 when none was found), the shortest interatomic distance in angstrom
  !> (periodic images included) and the density in g/cm3. A structure that cannot be checked at
  !> all (e.g. lattice with NaN) gives status NUCLEATE_ERROR_INVALID_ARGUMENT and the message.
  subroutine nucleate_check_structure(lattice, frac, numbers, valid, space_group, min_distance, &
                                      density, status, message)
    real(c_double), intent(in) :: lattice(3, 3), frac(:, :)
    integer, intent(in) :: numbers(:)
    logical, intent(out) :: valid
    integer, intent(out) :: space_group
    real(c_double), intent(out) :: min_distance, density
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    real(c_double) :: value
    valid = .false.
    space_group = 0
    min_distance = 0
    density = 0
    call check_one(lattice, frac, numbers, reply, status, message)
    if (status /= NUCLEATE_OK) return
    call reply_real('Check', reply, 'reports.valid', value, status, message)
    if (status /= NUCLEATE_OK) return
    valid = value /= 0
    call reply_real('Check', reply, 'reports.space_group_number', value, status, message)
    if (status /= NUCLEATE_OK) return
    space_group = nint(value)
    call reply_real('Check', reply, 'reports.min_distance', min_distance, status, message)
    if (status /= NUCLEATE_OK) return
    call reply_real('Check', reply, 'reports.density', density, status, message)
  end subroutine

  ! The "message" of the first error in a Check reply, for the Fortran caller's message.
  function extract_error_message(reply) result(text)
    character(len=*), intent(in) :: reply
    character(len=:), allocatable :: text
    integer :: start, finish
    start = index(reply, '"message":"')
    if (start == 0) then
      text = 'nucleate: the structure could not be checked'
      return
    end if
    start = start + len('"message":"')
    finish = start + index(reply(start:), '"') - 2
    text = reply(start:finish)
  end function

  !> Whether two structures are the same crystal (default tolerances), and the rms displacement of
  !> the best mapping in units of (V/N)^(1/3).
  subroutine nucleate_match_structures(lattice_a, frac_a, numbers_a, lattice_b, frac_b, numbers_b, &
                                       match, rms, status, message)
    real(c_double), intent(in) :: lattice_a(3, 3), frac_a(:, :), lattice_b(3, 3), frac_b(:, :)
    integer, intent(in) :: numbers_a(:), numbers_b(:)
    logical, intent(out) :: match
    real(c_double), intent(out) :: rms
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    real(c_double) :: value
    match = .false.
    rms = 0
    call nucleate_call_json('Match', '{"a":{"structure":' // &
                            nucleate_structure_json(lattice_a, frac_a, numbers_a) // &
                            '},"b":{"structure":' // &
                            nucleate_structure_json(lattice_b, frac_b, numbers_b) // '}}', reply, &
                            status, message)
    if (status /= NUCLEATE_OK) return
    call reply_real('Match', reply, 'match', value, status, message)
    if (status /= NUCLEATE_OK) return
    match = value /= 0
    call reply_real('Match', reply, 'rms', rms, status, message)
  end subroutine

  !> Groups equivalent structures (default tolerances). Structure k has counts(k) atoms: its
  !> lattice is lattices(:, :, k) and its atoms are the next counts(k) columns of frac and entries
  !> of numbers. On return group(k) is the 1-based group of structure k and representative(k) is
  !> true for the first structure of each group.
  subroutine nucleate_dedup_structures(lattices, frac, numbers, counts, group, representative, &
                                       status, message)
    real(c_double), intent(in) :: lattices(:, :, :), frac(:, :)
    integer, intent(in) :: numbers(:), counts(:)
    integer, allocatable, intent(out) :: group(:)
    logical, allocatable, intent(out) :: representative(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: request, reply
    real(c_double), allocatable :: values(:)
    integer :: k, first
    allocate(group(size(counts)), representative(size(counts)))
    group = 0
    representative = .false.
    if (size(lattices, 3) /= size(counts) .or. sum(counts) /= size(numbers) .or. &
        sum(counts) /= size(frac, 2)) then
      status = NUCLEATE_ERROR_INVALID_ARGUMENT
      message = 'nucleate_dedup_structures: lattices, counts, numbers and frac disagree in size'
      return
    end if
    request = '{"inputs":['
    first = 1
    do k = 1, size(counts)
      if (k > 1) request = request // ','
      request = request // '{"structure":' // nucleate_structure_json(lattices(:, :, k), &
                frac(:, first:first + counts(k) - 1), numbers(first:first + counts(k) - 1)) // '}'
      first = first + counts(k)
    end do
    call nucleate_call_json('Dedup', request // ']}', reply, status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Dedup', reply, 'entries.group', values, status, message)
    if (status /= NUCLEATE_OK) return
    group = nint(values) + 1
    call nucleate_reply_reals('Dedup', reply, 'entries.representative', values, status, message)
    if (status /= NUCLEATE_OK) return
    representative = values /= 0
    if (any(group < 1)) then
      status = NUCLEATE_ERROR_INVALID_ARGUMENT
      message = extract_error_message(reply)
    end if
  end subroutine

  !> Reads every structure of a CIF (.cif) or extended XYZ (.xyz, .extxyz) file. Structure k has
  !> counts(k) atoms, lattice lattices(:, :, k), and the next counts(k) columns of frac and
  !> entries of numbers. A structure that cannot be read stops the call with its message.
  subroutine nucleate_read_structures(path, lattices, frac, numbers, counts, status, message)
    character(len=*), intent(in) :: path
    real(c_double), allocatable, intent(out) :: lattices(:, :, :), frac(:, :)
    integer, allocatable, intent(out) :: numbers(:), counts(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: content, reply
    real(c_double), allocatable :: lattice_values(:), frac_values(:), number_values(:)
    integer :: k, m
    allocate(lattices(3, 3, 0), frac(3, 0), numbers(0), counts(0))
    call read_whole_file(path, content, status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_call_json('Convert', '{"inputs":[{"file":{"name":"' // json_escape(path) // &
                            '","content":"' // base64(content) // &
                            '"}}],"format":"STRUCTURE_FORMAT_JSON"}', reply, status, message)
    if (status /= NUCLEATE_OK) return
    call convert_error(reply, status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Convert', reply, 'structures.lattice', lattice_values, status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Convert', reply, 'structures.frac_coords', frac_values, status, &
                              message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Convert', reply, 'structures.atomic_numbers', number_values, &
                              status, message)
    if (status /= NUCLEATE_OK) return
    m = size(lattice_values) / 9
    deallocate(lattices, frac, numbers, counts)
    lattices = reshape(lattice_values, [3, 3, m])
    frac = reshape(frac_values, [3, size(frac_values) / 3])
    numbers = nint(number_values)
    ! Atoms per structure: the length of each structure's atomic_numbers.
    allocate(counts(m))
    do k = 1, m
      call nucleate_reply_reals('Convert', reply, 'structures[' // json_int(k - 1) // &
                                '].atomic_numbers', number_values, status, message)
      if (status /= NUCLEATE_OK) return
      counts(k) = size(number_values)
    end do
  end subroutine

  ! The whole file at `path` as one string (stream access: bytes as they are, newlines kept).
  subroutine read_whole_file(path, content, status, message)
    character(len=*), intent(in) :: path
    character(len=:), allocatable, intent(out) :: content
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    integer :: unit, size_bytes, io
    content = ''
    open(newunit=unit, file=path, access='stream', form='unformatted', status='old', &
         action='read', iostat=io)
    if (io /= 0) then
      status = NUCLEATE_ERROR_IO
      message = path // ': cannot open the file'
      return
    end if
    inquire(unit=unit, size=size_bytes)
    deallocate(content)
    allocate(character(len=max(size_bytes, 0)) :: content)
    if (size_bytes > 0) read(unit, iostat=io) content
    close(unit)
    if (io /= 0) then
      status = NUCLEATE_ERROR_IO
      message = path // ': cannot read the file'
      return
    end if
    status = NUCLEATE_OK
    message = ''
  end subroutine

  !> One structure written by the library as the text of a file in `format`: 'cif' (P1, every atom
  !> listed), 'cif_symmetrised' (the asymmetric unit and the operations of the space group found
  !> at 0.1 angstrom) or 'extxyz' (one extended XYZ frame: the cell in the comment line's
  !> Lattice="...", then a line per atom with its element symbol and Cartesian position in
  !> angstrom; every number with the shortest digits that read back exactly). Arguments as for
  !> nucleate_structure_json. A structure that cannot be written (e.g. a lattice with NaN) gives
  !> its status and the library's message, and an empty text.
  subroutine nucleate_structure_text(lattice, frac, numbers, format, text, status, message)
    real(c_double), intent(in) :: lattice(3, 3), frac(:, :)
    integer, intent(in) :: numbers(:)
    character(len=*), intent(in) :: format
    character(len=:), allocatable, intent(out) :: text
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    logical :: found
    text = ''
    select case (trim(format))
    case ('cif', 'cif_symmetrised', 'extxyz')
    case default
      status = NUCLEATE_ERROR_INVALID_ARGUMENT
      message = 'nucleate_structure_text: format ''' // trim(format) // &
                ''' is not one of ''cif'', ''cif_symmetrised'', ''extxyz'''
      return
    end select
    call nucleate_call_json('Convert', '{"inputs":[{"structure":' // &
                            nucleate_structure_json(lattice, frac, numbers) // &
                            '}],"format":"STRUCTURE_FORMAT_' // upper(trim(format)) // '"}', &
                            reply, status, message)
    if (status /= NUCLEATE_OK) return
    call convert_error(reply, status, message)
    if (status /= NUCLEATE_OK) return
    call json_string_member(reply, 'text', text, found)
    if (.not. found) then
      status = NUCLEATE_ERROR_INTERNAL
      message = 'nucleate_structure_text: the Convert reply has no text'
    end if
  end subroutine

  ! The Check reply for one structure. A structure that could not be checked carries its own
  ! error inside the reply; that error becomes the status and message here.
  subroutine check_one(lattice, frac, numbers, reply, status, message)
    real(c_double), intent(in) :: lattice(3, 3), frac(:, :)
    integer, intent(in) :: numbers(:)
    character(len=:), allocatable, intent(out) :: reply
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    real(c_double) :: value
    call nucleate_call_json('Check', '{"inputs":[{"structure":' // &
                            nucleate_structure_json(lattice, frac, numbers) // '}]}', reply, &
                            status, message)
    if (status /= NUCLEATE_OK) return
    call reply_real('Check', reply, 'reports.error.code', value, status, message)
    if (status /= NUCLEATE_OK) return
    if (nint(value) /= NUCLEATE_OK) then
      status = nint(value)
      message = extract_error_message(reply)
    end if
  end subroutine

  !> The elements of a structure that the library's element tables flag as toxic and as
  !> radioactive: symbols joined by commas (e.g. 'Cd,Se'), blank when none. Flags are for handling
  !> under local safety rules and licensed practice, not failures. Arguments as for
  !> nucleate_structure_json; a structure that cannot be checked gives its status and message.
  subroutine nucleate_element_flags(lattice, frac, numbers, toxic, radioactive, status, message)
    real(c_double), intent(in) :: lattice(3, 3), frac(:, :)
    integer, intent(in) :: numbers(:)
    character(len=:), allocatable, intent(out) :: toxic, radioactive
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    toxic = ''
    radioactive = ''
    call check_one(lattice, frac, numbers, reply, status, message)
    if (status /= NUCLEATE_OK) return
    ! One structure, one report: each list's name occurs once in the reply.
    toxic = json_string_list(reply, 'toxic_elements')
    radioactive = json_string_list(reply, 'radioactive_elements')
  end subroutine

  ! Standard base64 with padding (RFC 4648), as protobuf JSON writes bytes fields.
  function base64(bytes) result(text)
    character(len=*), intent(in) :: bytes
    character(len=:), allocatable :: text
    character(len=64), parameter :: alphabet = &
      'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/'
    integer :: i, j, n, k, chunk, b(3)
    allocate(character(len=4 * ((len(bytes) + 2) / 3)) :: text)
    k = 0
    do i = 1, len(bytes), 3
      n = min(3, len(bytes) - i + 1)
      b = 0
      do j = 1, n
        b(j) = iachar(bytes(i + j - 1:i + j - 1))
      end do
      chunk = b(1) * 65536 + b(2) * 256 + b(3)
      text(k + 1:k + 1) = alphabet(ibits(chunk, 18, 6) + 1:ibits(chunk, 18, 6) + 1)
      text(k + 2:k + 2) = alphabet(ibits(chunk, 12, 6) + 1:ibits(chunk, 12, 6) + 1)
      text(k + 3:k + 3) = merge(alphabet(ibits(chunk, 6, 6) + 1:ibits(chunk, 6, 6) + 1), '=', n >= 2)
      text(k + 4:k + 4) = merge(alphabet(ibits(chunk, 0, 6) + 1:ibits(chunk, 0, 6) + 1), '=', n >= 3)
      k = k + 4
    end do
  end function

  ! The string value of the first member named `key` in the protobuf JSON text `json`, decoded.
  ! Inside a JSON string every quote is escaped, so the characters "key":" can only be a member.
  subroutine json_string_member(json, key, value, found)
    character(len=*), intent(in) :: json, key
    character(len=:), allocatable, intent(out) :: value
    logical, intent(out) :: found
    integer :: start, last
    start = index(json, '"' // key // '":"')
    found = start > 0
    value = ''
    if (found) call json_decode_string(json, start + len(key) + 4, value, last)
  end subroutine

  ! The strings of the array that is the first member named `key` in `json`, joined by commas;
  ! blank when the array is empty or the member is absent.
  function json_string_list(json, key) result(joined)
    character(len=*), intent(in) :: json, key
    character(len=:), allocatable :: joined, item
    integer :: at, last
    joined = ''
    at = index(json, '"' // key // '":[')
    if (at == 0) return
    at = at + len(key) + 4
    do while (at <= len(json))
      select case (json(at:at))
      case ('"')
        call json_decode_string(json, at + 1, item, last)
        if (len(joined) > 0) joined = joined // ','
        joined = joined // item
        at = last + 1
      case (']')
        exit
      case default  ! the commas (and any spaces) between the strings
        at = at + 1
      end select
    end do
  end function

  ! Decodes the JSON string whose characters start at json(first:), just after its opening quote,
  ! into `value` (\u escapes as UTF-8); `last` is the position of its closing quote.
  subroutine json_decode_string(json, first, value, last)
    character(len=*), intent(in) :: json
    integer, intent(in) :: first
    character(len=:), allocatable, intent(out) :: value
    integer, intent(out) :: last
    character(len=len(json)) :: buffer  ! a decoded string is never longer than its JSON
    integer :: i, n, code, low, io
    n = 0
    i = first
    do while (i <= len(json))
      if (json(i:i) == '"') exit
      if (json(i:i) /= '\' .or. i == len(json)) then
        call put(ichar(json(i:i)))
        i = i + 1
        cycle
      end if
      i = i + 1
      select case (json(i:i))
      case ('n')
        call put(10)
      case ('t')
        call put(9)
      case ('r')
        call put(13)
      case ('b')
        call put(8)
      case ('f')
        call put(12)
      case ('u')
        code = hex4(i + 1)
        i = i + 4
        ! A surrogate pair (two \u escapes) is one code point above U+FFFF.
        if (code >= 55296 .and. code <= 56319 .and. i + 6 <= len(json)) then
          if (json(i + 1:i + 2) == '\u') then
            low = hex4(i + 3)
            if (low >= 56320 .and. low <= 57343) then
              code = 65536 + (code - 55296) * 1024 + (low - 56320)
              i = i + 6
            end if
          end if
        end if
        call put_utf8(code)
      case default  ! \" \\ \/
        call put(ichar(json(i:i)))
      end select
      i = i + 1
    end do
    last = i
    value = buffer(1:n)
  contains
    ! The four hexadecimal digits at json(at:), or the code of '?' when they are not.
    integer function hex4(at)
      integer, intent(in) :: at
      hex4 = iachar('?')
      if (at + 3 > len(json)) return
      read(json(at:at + 3), '(z4)', iostat=io) hex4
      if (io /= 0) hex4 = iachar('?')
    end function
    subroutine put(byte)
      integer, intent(in) :: byte
      n = n + 1
      buffer(n:n) = char(byte)
    end subroutine
    subroutine put_utf8(point)
      integer, intent(in) :: point
      if (point < 128) then
        call put(point)
      else if (point < 2048) then
        call put(192 + point / 64)
        call put(128 + mod(point, 64))
      else if (point < 65536) then
        call put(224 + point / 4096)
        call put(128 + mod(point / 64, 64))
        call put(128 + mod(point, 64))
      else
        call put(240 + point / 262144)
        call put(128 + mod(point / 4096, 64))
        call put(128 + mod(point / 64, 64))
        call put(128 + mod(point, 64))
      end if
    end subroutine
  end subroutine

  ! A string's characters escaped for a JSON string literal (quotes and backslashes).
  function json_escape(raw) result(text)
    character(len=*), intent(in) :: raw
    character(len=:), allocatable :: text
    integer :: i
    text = ''
    do i = 1, len(raw)
      if (raw(i:i) == '"' .or. raw(i:i) == '\') text = text // '\'
      text = text // raw(i:i)
    end do
  end function

  pure function upper(text) result(out)
    character(len=*), intent(in) :: text
    character(len=len(text)) :: out
    integer :: i, code
    out = text
    do i = 1, len(text)
      code = iachar(text(i:i))
      if (code >= iachar('a') .and. code <= iachar('z')) out(i:i) = achar(code - 32)
    end do
  end function

  ! A JSON string literal of `text`: quotes, backslashes and control characters escaped.
  function json_string(text) result(out)
    character(len=*), intent(in) :: text
    character(len=:), allocatable :: out
    character(len=*), parameter :: hex = '0123456789abcdef'
    integer :: i, code
    out = '"'
    do i = 1, len(text)
      code = iachar(text(i:i))
      select case (code)
      case (34)
        out = out // '\"'
      case (92)
        out = out // '\\'
      case (10)
        out = out // '\n'
      case (0:9, 11:31)
        out = out // '\u00' // hex(code / 16 + 1:code / 16 + 1) // hex(mod(code, 16) + 1:mod(code, 16) + 1)
      case default
        out = out // text(i:i)
      end select
    end do
    out = out // '"'
  end function

  !> Trains a denoiser from the YAML configuration file at `config_path` (keys documented in
  !> core/train/CONFIG.md; relative paths in it are taken from the file's directory). On return
  !> the optimiser steps and epochs done and the last training loss. The model is written where
  !> the configuration says. A long call: it returns when training ends.
  subroutine nucleate_train(config_path, steps_done, epochs_done, last_loss, status, message)
    character(len=*), intent(in) :: config_path
    integer, intent(out) :: steps_done, epochs_done
    real(c_double), intent(out) :: last_loss
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: text, directory, reply
    real(c_double) :: value
    integer :: slash
    steps_done = 0
    epochs_done = 0
    last_loss = 0
    call read_whole_file(config_path, text, status, message)
    if (status /= NUCLEATE_OK) return
    slash = index(config_path, '/', back=.true.)
    directory = '.'
    if (slash > 0) directory = config_path(1:slash - 1)
    call nucleate_call_json('Train', '{"config_yaml":' // json_string(text) // &
                            ',"config_directory":' // json_string(directory) // &
                            ',"config_name":' // json_string(config_path) // '}', reply, status, &
                            message)
    if (status /= NUCLEATE_OK) return
    call reply_real('Train', reply, 'steps_done', value, status, message)
    if (status /= NUCLEATE_OK) return
    steps_done = nint(value)
    call reply_real('Train', reply, 'epochs_done', value, status, message)
    if (status /= NUCLEATE_OK) return
    epochs_done = nint(value)
    call reply_real('Train', reply, 'last_loss', last_loss, status, message)
  end subroutine

  !> The number of trained parameters of the model file at `path`, after the file has been fully
  !> checked (format version, sizes, checksum): a cheap way to validate a model before a job.
  subroutine nucleate_model_parameters(path, parameters, status, message)
    character(len=*), intent(in) :: path
    integer, intent(out) :: parameters
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    real(c_double) :: value
    parameters = 0
    call nucleate_call_json('ModelInfo', '{"path":' // json_string(path) // '}', reply, status, &
                            message)
    if (status /= NUCLEATE_OK) return
    call reply_real('ModelInfo', reply, 'parameters', value, status, message)
    if (status == NUCLEATE_OK) parameters = nint(value)
  end subroutine

  !> One denoiser evaluation of the model at `model_path` on one noisy cell at step `step`
  !> (1..T), species given: the predicted fractional-coordinate score (3 x atoms, mean-free) and
  !> the predicted noise of the 6 lattice features.
  subroutine nucleate_evaluate(model_path, lattice, frac, numbers, step, score, lattice_noise, &
                               status, message)
    character(len=*), intent(in) :: model_path
    real(c_double), intent(in) :: lattice(3, 3), frac(:, :)
    integer, intent(in) :: numbers(:), step
    real(c_double), intent(out) :: score(3, size(numbers)), lattice_noise(6)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    real(c_double), allocatable :: values(:)
    score = 0
    lattice_noise = 0
    call nucleate_call_json('Evaluate', '{"model_path":' // json_string(model_path) // &
                            ',"cells":[{"structure":' // &
                            nucleate_structure_json(lattice, frac, numbers) // ',"step":' // &
                            json_int(step) // '}]}', reply, status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Evaluate', reply, 'outputs.coordinate_score', values, status, message)
    if (status /= NUCLEATE_OK) return
    if (size(values) /= 3 * size(numbers)) then
      status = NUCLEATE_ERROR_INTERNAL
      message = 'nucleate: Evaluate returned a score of the wrong size'
      return
    end if
    score = reshape(values, [3, size(numbers)])
    call nucleate_reply_reals('Evaluate', reply, 'outputs.lattice_noise', values, status, message)
    if (status /= NUCLEATE_OK) return
    lattice_noise = values(1:6)
  end subroutine

  !> Candidate crystal structures from any SampleRequest (schemas/nucleate/v1/sample.proto):
  !> `request_json` is its protobuf JSON, built by the caller, with any task (composition,
  !> de_novo, variation, constrained), conditions and guidance, sampler and limits; structures for
  !> the variation and constrained tasks can be written with nucleate_structure_json. Candidates
  !> are hypotheses from a statistical model, not predictions of stable compounds: confirm them
  !> with DFT and experiment, and follow local safety rules and licensed practice for toxic or
  !> radioactive elements. The full reply, with each candidate's problems, toxic and radioactive
  !> element flags and duplicate groups, comes from nucleate_call_json('Sample', request_json, ...).
  !>
  !> Results are packed as nucleate_read_structures returns them (and nucleate_dedup_structures
  !> takes them): candidate k (k = 1..count, sample first_index + k - 1) has counts(k) atoms and
  !> lattice lattices(:, :, k), whose column i is cell vector i (a, b, c) in Cartesian angstrom;
  !> its atoms are columns first .. first + counts(k) - 1 of frac (fractional coordinates in
  !> [0, 1)) and the same entries of numbers (atomic numbers), where first = 1 +
  !> sum(counts(1:k-1)). valid(k) is true when the candidate passed every validity rule at the
  !> request's thresholds; space_group(k) is its space-group number at the request's symprec (0
  !> when none was found). A candidate whose chain failed (e.g. its cell blew up) has counts(k) =
  !> 0, a zero lattice, valid(k) false and space_group(k) 0, and the call still succeeds. On
  !> failure every array is empty and `message` names the field that was wrong.
  subroutine nucleate_sample_request(request_json, lattices, frac, numbers, counts, valid, &
                                     space_group, status, message)
    character(len=*), intent(in) :: request_json
    real(c_double), allocatable, intent(out) :: lattices(:, :, :), frac(:, :)
    integer, allocatable, intent(out) :: numbers(:), counts(:), space_group(:)
    logical, allocatable, intent(out) :: valid(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=:), allocatable :: reply
    real(c_double), allocatable :: error_codes(:), atoms(:), flags(:), groups(:)
    real(c_double), allocatable :: lattice_values(:), frac_values(:), number_values(:)
    logical, allocatable :: failed(:)
    integer :: k, m
    allocate(lattices(3, 3, 0), frac(3, 0), numbers(0), counts(0), valid(0), space_group(0))
    call nucleate_call_json('Sample', request_json, reply, status, message)
    if (status /= NUCLEATE_OK) return
    ! One value per candidate from its report (a failed candidate's report holds only its error);
    ! the structure fields skip failed candidates, which have none.
    call nucleate_reply_reals('Sample', reply, 'candidates.report.error.code', error_codes, &
                              status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Sample', reply, 'candidates.report.num_atoms', atoms, status, &
                              message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Sample', reply, 'candidates.report.valid', flags, status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Sample', reply, 'candidates.report.space_group_number', groups, &
                              status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Sample', reply, 'candidates.structure.lattice', lattice_values, &
                              status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Sample', reply, 'candidates.structure.frac_coords', frac_values, &
                              status, message)
    if (status /= NUCLEATE_OK) return
    call nucleate_reply_reals('Sample', reply, 'candidates.structure.atomic_numbers', &
                              number_values, status, message)
    if (status /= NUCLEATE_OK) return
    failed = nint(error_codes) /= NUCLEATE_OK
    where (failed) atoms = 0
    if (9 * size(pack(failed, .not. failed)) /= size(lattice_values) .or. &
        nint(sum(atoms)) /= size(number_values) .or. 3 * size(number_values) /= size(frac_values)) &
        then
      status = NUCLEATE_ERROR_INTERNAL
      message = 'nucleate_sample_request: the Sample reply''s candidates and structures ' // &
                'disagree in size'
      return
    end if
    deallocate(lattices, frac, numbers, counts, valid, space_group)
    allocate(lattices(3, 3, size(failed)))
    lattices = 0
    m = 0
    do k = 1, size(failed)
      if (failed(k)) cycle
      lattices(:, :, k) = reshape(lattice_values(9 * m + 1:9 * m + 9), [3, 3])
      m = m + 1
    end do
    frac = reshape(frac_values, [3, size(number_values)])
    numbers = nint(number_values)
    counts = nint(atoms)
    valid = nint(flags) /= 0 .and. .not. failed
    space_group = nint(groups)
  end subroutine

  !> Candidate crystal structures of `formula` (e.g. "SrTiO3", "Ca3(PO4)2") with min_units to
  !> max_units formula units per cell, sampled from the model at `model_path` for a DFT workflow
  !> to relax and rank, at the default thresholds and symprec (0.1 angstrom). Candidates are
  !> hypotheses from a statistical model, not predictions of stable compounds (see
  !> nucleate_sample_request, which this calls, for the packed results and for the other tasks).
  !>
  !> Candidate k (k = 1..count) is sample first_index + k - 1 of the random stream keyed by `seed`
  !> (both 0..2^31-1 here), and the same bytes whatever the count: n jobs of an array that each
  !> ask for `count` candidates from first_index = job * count together get one run's candidates.
  !>
  !> Optional: `sampler`, one of 'ddpm' (the default), 'ddim', 'pc' (predictor-corrector) or
  !> 'ode' (probability flow); `steps`, the reverse steps, evenly respaced over the model's T
  !> (default: all T).
  subroutine nucleate_sample(model_path, formula, min_units, max_units, count, seed, first_index, &
                             lattices, frac, numbers, counts, valid, space_group, status, message, &
                             sampler, steps)
    character(len=*), intent(in) :: model_path, formula
    integer, intent(in) :: min_units, max_units, count, seed, first_index
    real(c_double), allocatable, intent(out) :: lattices(:, :, :), frac(:, :)
    integer, allocatable, intent(out) :: numbers(:), counts(:), space_group(:)
    logical, allocatable, intent(out) :: valid(:)
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    character(len=*), intent(in), optional :: sampler
    integer, intent(in), optional :: steps
    character(len=:), allocatable :: settings
    allocate(lattices(3, 3, 0), frac(3, 0), numbers(0), counts(0), valid(0), space_group(0))
    ! Negative values would reach the library as unsigned fields and come back as a malformed
    ! request; here the caller learns which argument was wrong.
    if (seed < 0 .or. first_index < 0) then
      status = NUCLEATE_ERROR_INVALID_ARGUMENT
      message = 'nucleate_sample: ' // trim(merge('seed       ', 'first_index', seed < 0)) // &
                ' must be >= 0'
      return
    end if
    settings = ''
    if (present(sampler)) then
      select case (trim(sampler))
      case ('ddpm')
        settings = '"kind":"SAMPLER_KIND_DDPM"'
      case ('ddim')
        settings = '"kind":"SAMPLER_KIND_DDIM"'
      case ('pc')
        settings = '"kind":"SAMPLER_KIND_PREDICTOR_CORRECTOR"'
      case ('ode')
        settings = '"kind":"SAMPLER_KIND_PROBABILITY_FLOW"'
      case default
        status = NUCLEATE_ERROR_INVALID_ARGUMENT
        message = 'nucleate_sample: sampler ''' // trim(sampler) // &
                  ''' is not one of ''ddpm'', ''ddim'', ''pc'', ''ode'''
        return
      end select
    end if
    if (present(steps)) then
      if (len(settings) > 0) settings = settings // ','
      settings = settings // '"steps":' // json_int(steps)
    end if
    call nucleate_sample_request('{"model_path":' // json_string(model_path) // &
                                 ',"composition":{"formula":' // json_string(formula) // &
                                 ',"min_formula_units":' // json_int(min_units) // &
                                 ',"max_formula_units":' // json_int(max_units) // &
                                 '},"sampler":{' // settings // '},"seed":' // json_int(seed) // &
                                 ',"first_index":' // json_int(first_index) // ',"count":' // &
                                 json_int(count) // '}', lattices, frac, numbers, counts, valid, &
                                 space_group, status, message)
  end subroutine

  ! The first unreadable input of a Convert reply as a status and message (NUCLEATE_OK if none).
  subroutine convert_error(reply, status, message)
    character(len=*), intent(in) :: reply
    integer, intent(out) :: status
    character(len=:), allocatable, intent(out) :: message
    real(c_double), allocatable :: error_codes(:)
    call nucleate_reply_reals('Convert', reply, 'unreadable.error.code', error_codes, status, &
                              message)
    if (status /= NUCLEATE_OK) return
    if (size(error_codes) > 0) then
      status = nint(error_codes(1))
      message = extract_error_message(reply)
    end if
  end subroutine

end module nucleate
