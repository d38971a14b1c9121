# The test-suite build of the targets in CMakeLists.txt: each fuzz target's source linked with
# replay_main.cc, run once over its seed corpus and its findings (test `fuzz_replay.<name>`,
# label replay). No libFuzzer, so any compiler; under NUCLEATE_SANITIZE the sanitizers of the
# suite apply.

# nucleate_fuzzer(<name> MAX_LEN <bytes> [WORKING_DIRECTORY <dir>] LIBRARIES <targets...>)
# MAX_LEN matters to libFuzzer only: committed inputs are replayed whatever their size.
function(nucleate_fuzzer name)
  cmake_parse_arguments(FUZZ "" "MAX_LEN;WORKING_DIRECTORY" "LIBRARIES" ${ARGN})
  if(NOT FUZZ_WORKING_DIRECTORY)
    set(FUZZ_WORKING_DIRECTORY "${CMAKE_CURRENT_BINARY_DIR}")
  endif()
  set(inputs "${CMAKE_CURRENT_SOURCE_DIR}/corpus/${name}")
  if(EXISTS "${CMAKE_CURRENT_SOURCE_DIR}/findings/${name}")
    list(APPEND inputs "${CMAKE_CURRENT_SOURCE_DIR}/findings/${name}")
  endif()

  add_executable(replay_${name} ${name}.cc replay_main.cc)
  target_include_directories(replay_${name} PRIVATE "${CMAKE_CURRENT_SOURCE_DIR}")
  target_link_libraries(replay_${name} PRIVATE ${FUZZ_LIBRARIES} protobuf::libprotobuf Threads::Threads)
  target_compile_options(replay_${name} PRIVATE -Wall -Wextra)

  add_test(NAME fuzz_replay.${name} COMMAND replay_${name} ${inputs}
           WORKING_DIRECTORY "${FUZZ_WORKING_DIRECTORY}")
  # The library never writes to stderr (nucleate.h): libprotobuf's own log lines (it logs text
  # that is not UTF-8 before refusing it) count as a failure too.
  set_tests_properties(fuzz_replay.${name} PROPERTIES
    LABELS replay
    TIMEOUT 300
    FAIL_REGULAR_EXPRESSION "\\[libprotobuf")
endfunction()
