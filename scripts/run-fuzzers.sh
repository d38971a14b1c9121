#!/usr/bin/env bash
# Builds the libFuzzer targets of tests/fuzz in a build directory of their own and runs each for
# a while, starting from a copy of its committed seed corpus.
#
#   scripts/run-fuzzers.sh [build-dir] [seconds-per-target] [target ...]
#
# build-dir defaults to build-fuzz beside this repository's build/, seconds to 600, targets to all
# of them (fuzz_call_json, fuzz_call_binary, fuzz_cif_reader, fuzz_extxyz_reader,
# fuzz_train_config, fuzz_model_bundle). JOBS (default 2) sets the build's parallel jobs.
# Prints per target the inputs executed and whether a crash, leak, timeout or out-of-memory input
# was saved (or, for fuzz_train_config, an exception other than nucleate::Error escaped);
# exits 1 if any was. Each target's log, working corpus and saved inputs are under
# <build-dir>/fuzz-runs/<target>/.
set -euo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${1:-$root/build-fuzz}"
seconds="${2:-600}"
shift $(( $# > 2 ? 2 : $# ))
wanted=("$@")
jobs="${JOBS:-2}"

if ! [[ "$seconds" =~ ^[1-9][0-9]*$ ]]; then
  echo "run-fuzzers.sh: seconds-per-target must be a positive whole number, got '$seconds'" >&2
  exit 2
fi
if ! command -v clang++ >/dev/null; then
  echo "run-fuzzers.sh: clang++ not found (libFuzzer ships with clang; on Debian 12: apt-get install clang)" >&2
  exit 2
fi

# Its own build directory: every object is instrumented (fuzzer-no-link adds the coverage
# counters libFuzzer steers by, address and undefined the checks), which must not mix with the
# ordinary build. Only what the fuzzers link is needed, so the CLI, MPI driver, Fortran module
# and test suite stay off. -O1 -g1: the optimisation libFuzzer's documentation builds with, and
# line numbers in the sanitizer reports, quicker to compile than -O2 -g.
sanitize="-fsanitize=fuzzer-no-link,address,undefined -fno-omit-frame-pointer"
cmake -S "$root" -B "$build" \
  -DCMAKE_BUILD_TYPE=Sanitize -DCMAKE_C_FLAGS_SANITIZE="-O1 -g1" -DCMAKE_CXX_FLAGS_SANITIZE="-O1 -g1" \
  -DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ \
  -DCMAKE_C_FLAGS="$sanitize" -DCMAKE_CXX_FLAGS="$sanitize" \
  -DNUCLEATE_BUILD_FUZZERS=ON -DNUCLEATE_BUILD_TESTS=OFF -DNUCLEATE_BUILD_FORTRAN=OFF \
  -DNUCLEATE_BUILD_CLI=OFF -DNUCLEATE_BUILD_MPI=OFF -DNUCLEATE_SANITIZE=OFF
# The fuzzers alone: libnucleate.so cannot link with clang's sanitizer runtimes (see
# tests/fuzz/CMakeLists.txt).
cmake --build "$build" --target nucleate_fuzzers -j "$jobs"

# Written by tests/fuzz/CMakeLists.txt: name, max_len, timeout, executable, seeds, working dir.
list="$build/tests/fuzz/fuzzers.tsv"
if [[ ! -s "$list" ]]; then
  echo "run-fuzzers.sh: $list is missing: is NUCLEATE_BUILD_FUZZERS wired into CMakeLists.txt?" >&2
  exit 2
fi

# Undefined behaviour in the library is reported and would otherwise be recovered from: halt so
# libFuzzer saves the input. Leaks are checked after every input (libFuzzer's default with ASan).
export UBSAN_OPTIONS="halt_on_error=1:print_stacktrace=1"

runs="$build/fuzz-runs"
failed=0
ran=0
printf '%-20s %14s  %s\n' target executions result
while IFS=$'\t' read -r name max_len timeout exe seeds workdir; do
  if (( ${#wanted[@]} > 0 )) && [[ " ${wanted[*]} " != *" $name "* ]]; then continue; fi
  ran=$((ran + 1))
  out="$runs/$name"
  # A copy of the seeds as the working corpus: libFuzzer adds what it finds to the first corpus
  # directory, and the committed seeds must stay as they are.
  rm -rf "$out"
  mkdir -p "$out"
  cp -r "$seeds" "$out/corpus"
  status=0
  (cd "$workdir" && "$exe" -max_total_time="$seconds" -max_len="$max_len" -timeout="$timeout" \
      -print_final_stats=1 -artifact_prefix="$out/" "$out/corpus") </dev/null >"$out/log" 2>&1 \
      || status=$?
  executions="$(sed -n 's/^stat::number_of_executed_units: *//p' "$out/log" | tail -n 1)"
  # slow-unit-* files are only slow inputs; crash-, leak-, timeout- and oom- ones are findings.
  saved="$(find "$out" -maxdepth 1 -type f \( -name 'crash-*' -o -name 'leak-*' -o \
      -name 'timeout-*' -o -name 'oom-*' \) | sort | tr '\n' ' ')"
  if [[ -n "$saved" || $status -ne 0 ]]; then
    failed=1
    printf '%-20s %14s  FOUND (exit %d): %s(log: %s)\n' "$name" "${executions:-?}" "$status" \
      "$saved" "$out/log"
  else
    # fuzz_train_config prints "ESCAPED" for an exception other than nucleate::Error and goes on
    # (train_config.h promises nucleate::Error only): a finding too, with its input in the log.
    escapes="$(grep -c '^ESCAPED input:' "$out/log" || true)"
    if (( escapes > 0 )); then
      failed=1
      printf '%-20s %14s  FOUND: %d escaped exceptions printed in %s\n' "$name" \
        "${executions:-?}" "$escapes" "$out/log"
    else
      printf '%-20s %14s  no crash\n' "$name" "${executions:-?}"
    fi
  fi
done <"$list"

if (( ran == 0 )); then
  echo "run-fuzzers.sh: no target matched: ${wanted[*]}" >&2
  exit 2
fi
exit "$failed"
