# The libFuzzer build of the targets in CMakeLists.txt (NUCLEATE_BUILD_FUZZERS=ON). The ctest
# tests `fuzz.<name>` (label fuzz) run each briefly over its seed corpus.
#
# Build these targets alone (`--target nucleate_fuzzers`): under clang the sanitizer runtimes go
# into executables only, so libnucleate.so, linked with --no-undefined, cannot link in this
# configuration.

if(NOT CMAKE_CXX_COMPILER_ID STREQUAL "Clang")
  message(FATAL_ERROR
    "NUCLEATE_BUILD_FUZZERS needs clang++ (libFuzzer ships with clang): configure with "
    "-DCMAKE_CXX_COMPILER=clang++, or run scripts/run-fuzzers.sh")
endif()

set(NUCLEATE_FUZZ_SANITIZERS -fsanitize=fuzzer,address,undefined)
# Each run's outputs (inputs found, crash files) go to the build tree, never into the committed
# seed corpora: libFuzzer writes what it finds into the first corpus directory it is given.
set(NUCLEATE_FUZZ_WORK "${CMAKE_CURRENT_BINARY_DIR}/work")
# What scripts/run-fuzzers.sh runs, one line per target (tab-separated: name, max_len, timeout,
# executable, seed corpus, working directory), generated so that the script and ctest share one
# list.
set_property(GLOBAL PROPERTY NUCLEATE_FUZZ_LIST "")

add_custom_target(nucleate_fuzzers)

# nucleate_fuzzer(<name> MAX_LEN <bytes> [WORKING_DIRECTORY <dir>] LIBRARIES <targets...>)
# MAX_LEN bounds the input size (why each bound: the comment atop <name>.cc). Every input must
# finish within 30 s (-timeout) even under the sanitizers; a slower one is reported as a finding.
function(nucleate_fuzzer name)
  cmake_parse_arguments(FUZZ "" "MAX_LEN;WORKING_DIRECTORY" "LIBRARIES" ${ARGN})
  if(NOT FUZZ_WORKING_DIRECTORY)
    set(FUZZ_WORKING_DIRECTORY "${CMAKE_CURRENT_BINARY_DIR}")
  endif()
  set(timeout 30)
  set(seeds "${CMAKE_CURRENT_SOURCE_DIR}/corpus/${name}")
  set(work "${NUCLEATE_FUZZ_WORK}/${name}")

  add_executable(${name} ${name}.cc)
  target_include_directories(${name} PRIVATE "${CMAKE_CURRENT_SOURCE_DIR}")
  target_link_libraries(${name} PRIVATE ${FUZZ_LIBRARIES} protobuf::libprotobuf Threads::Threads)
  # -fno-sanitize-recover makes undefined behaviour in these drivers a crash libFuzzer saves; in
  # the library the same comes from UBSAN_OPTIONS=halt_on_error=1 below.
  target_compile_options(${name} PRIVATE ${NUCLEATE_FUZZ_SANITIZERS} -fno-omit-frame-pointer
                                         -fno-sanitize-recover=undefined)
  target_link_options(${name} PRIVATE ${NUCLEATE_FUZZ_SANITIZERS})
  add_dependencies(nucleate_fuzzers ${name})

  # A fresh working corpus for every ctest run, so the test sees the same seeds each time.
  add_test(NAME fuzz.${name}.clean COMMAND "${CMAKE_COMMAND}" -E rm -rf "${work}")
  set_tests_properties(fuzz.${name}.clean PROPERTIES LABELS fuzz FIXTURES_SETUP fuzz_${name})
  # 20 s of mutations after the seeds are read: long enough to catch shallow bugs in every target
  # on each run, short enough for a test stage (6 targets, about 2 minutes on one core).
  add_test(NAME fuzz.${name}
    COMMAND ${name} -max_total_time=20 -max_len=${FUZZ_MAX_LEN} -timeout=${timeout}
            -print_final_stats=1 -create_missing_dirs=1 "-artifact_prefix=${work}/"
            "${work}/corpus" "${seeds}"
    WORKING_DIRECTORY "${FUZZ_WORKING_DIRECTORY}")
  set_tests_properties(fuzz.${name} PROPERTIES
    LABELS fuzz
    TIMEOUT 90
    FIXTURES_REQUIRED fuzz_${name}
    ENVIRONMENT "UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1")

  set_property(GLOBAL APPEND_STRING PROPERTY NUCLEATE_FUZZ_LIST
    "${name}\t${FUZZ_MAX_LEN}\t${timeout}\t$<TARGET_FILE:${name}>\t${seeds}\t${FUZZ_WORKING_DIRECTORY}\n")
endfunction()

