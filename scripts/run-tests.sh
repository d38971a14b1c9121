#!/usr/bin/env bash
# Every test, from a fresh Debian 12 machine: installs dependencies, builds once, runs the whole
# suite once. The sanitizer builds (scripts/run-sanitizers.sh) and fuzzing
# (scripts/run-fuzzers.sh) run from their own scripts, each in a build directory of its own.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"

"$root/scripts/install-deps.sh"
"$root/scripts/build.sh" -DNUCLEATE_BUILD_TESTS=ON

# One run of the whole suite; the label summary at the end shows each group (unit, abi,
# conformance, reference, cli, integrations, consumers, slurm, replay, catalogue, concurrency)
# with its time.
cd "$build"
ctest --output-on-failure -j "$(nproc)"
