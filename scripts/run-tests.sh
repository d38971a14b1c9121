#!/usr/bin/env bash
# Every test, from a fresh Debian 12 machine: installs dependencies, builds once, runs the whole
# suite once; then most of it again under AddressSanitizer and UndefinedBehaviorSanitizer, the
# concurrency test under ThreadSanitizer (scripts/run-sanitizers.sh), and each fuzz target for
# FUZZ_SECONDS (default 15) from its seed corpus (scripts/run-fuzzers.sh; long runs: call it
# directly). Each stage builds in a directory of its own beside build/.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"

"$root/scripts/install-deps.sh"
"$root/scripts/build.sh" -DNUCLEATE_BUILD_TESTS=ON

# One run of the whole suite; the label summary at the end shows each group (unit, abi,
# conformance, reference, cli, integrations, consumers, slurm, replay, catalogue, concurrency)
# with its time.
(cd "$build" && ctest --output-on-failure -j "$(nproc)")

echo "== sanitizers"
"$root/scripts/run-sanitizers.sh"
echo "== fuzzing, ${FUZZ_SECONDS:-15} s per target"
"$root/scripts/run-fuzzers.sh" "$build-fuzz" "${FUZZ_SECONDS:-15}"
