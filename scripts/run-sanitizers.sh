#!/usr/bin/env bash
# The test suite under AddressSanitizer and UndefinedBehaviorSanitizer, and the concurrency test
# under ThreadSanitizer, each in a build directory of its own beside build/ (build-asan,
# build-tsan; instrumented objects must not mix with the ordinary build).
#
#   scripts/run-sanitizers.sh [asan] [tsan]      (default: both)
#
# The AddressSanitizer run covers the labels unit, abi, conformance, replay, catalogue and
# concurrency. Left out, with the reason: consumers (builds the installed package with a second,
# uninstrumented project), slurm and integrations (MPI and Slurm daemons, outside our code), cli
# and reference (the command-line tool and the outside cross-checks drive the same library code
# the other labels reach, at several times the run time) and the benchmarks (not tests). The
# Fortran module is in (its test programs free their arrays before they end, so a leak report is
# the module's own). LeakSanitizer suppressions, each with its reason: tests/sanitizers/lsan.supp.
# JOBS sets the parallel build jobs (default: all cores).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
base="${NUCLEATE_BUILD_DIR:-$root/build}"
jobs="${JOBS:-$(nproc)}"
stages=("$@")
(( ${#stages[@]} > 0 )) || stages=(asan tsan)

configure() {  # configure BUILD_DIR CMAKE_ARGS...
  local build=$1
  shift
  mkdir -p "$build"
  # -O1 -g1: quicker to build than -O2 -g, still line numbers in every report (the level the
  # sanitizer documentation suggests for reasonable speed).
  cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=Sanitize -DCMAKE_C_FLAGS_SANITIZE="-O1 -g1" \
    -DCMAKE_CXX_FLAGS_SANITIZE="-O1 -g1" -DCMAKE_Fortran_FLAGS_SANITIZE="-O1 -g1" \
    -DNUCLEATE_BUILD_TESTS=ON \
    -DNUCLEATE_BUILD_BENCHMARKS=OFF -DNUCLEATE_BUILD_MPI=OFF "$@" >"$build/configure.log" 2>&1 \
    || { cat "$build/configure.log" >&2; exit 1; }
}

for stage in "${stages[@]}"; do
  case "$stage" in
    asan)
      build="$base-asan"
      configure "$build" -DNUCLEATE_SANITIZE=ON
      cmake --build "$build" -j "$jobs"
      # Any report fails the test that produced it: errors halt (UBSan included), leaks are
      # checked at every exit.
      export ASAN_OPTIONS="detect_leaks=1:abort_on_error=0:halt_on_error=1"
      export LSAN_OPTIONS="suppressions=$root/tests/sanitizers/lsan.supp:print_suppressions=0"
      export UBSAN_OPTIONS="halt_on_error=1:print_stacktrace=1"
      (cd "$build" && ctest --output-on-failure -j "$(nproc)" \
        -L "^(unit|abi|conformance|replay|catalogue|concurrency)$")
      unset ASAN_OPTIONS LSAN_OPTIONS UBSAN_OPTIONS
      ;;
    tsan)
      build="$base-tsan"
      configure "$build" -DNUCLEATE_BUILD_CLI=OFF -DNUCLEATE_BUILD_FORTRAN=OFF \
        -DCMAKE_C_FLAGS="-fsanitize=thread" -DCMAKE_CXX_FLAGS="-fsanitize=thread" \
        -DCMAKE_EXE_LINKER_FLAGS="-fsanitize=thread" -DCMAKE_SHARED_LINKER_FLAGS="-fsanitize=thread"
      cmake --build "$build" -j "$jobs" --target nucleate_concurrency_tests
      # spglib's OpenMP runtime (libgomp) is not instrumented, so ThreadSanitizer cannot see its
      # barriers; one OpenMP thread keeps spglib inside the calling thread, where nucleate's own
      # locking is what is tested.
      (cd "$build" && OMP_NUM_THREADS=1 TSAN_OPTIONS="halt_on_error=1:second_deadlock_stack=1" \
        ctest --output-on-failure -L concurrency)
      ;;
    *)
      echo "run-sanitizers.sh: unknown stage '$stage' (asan or tsan)" >&2
      exit 2
      ;;
  esac
done
