#!/usr/bin/env bash
# Every test, from a fresh Debian 12 machine: installs dependencies, builds once, then runs the
# whole suite once.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"

"$root/scripts/install-deps.sh"
"$root/scripts/build.sh" -DNUCLEATE_BUILD_TESTS=ON

cd "$build"
# One run of the whole suite; the label summary at the end shows each group
# (unit, abi, conformance, reference, cli, integrations, consumers, slurm) with its time.
ctest --output-on-failure -j "$(nproc)"
