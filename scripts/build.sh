#!/usr/bin/env bash
# Configures and builds nucleate into build/ (or $NUCLEATE_BUILD_DIR), once; later calls rebuild
# only what changed. Extra arguments go to cmake's configure step.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"
mkdir -p "$build"
cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=Release "$@" > "$build/configure.log" 2>&1 \
  || { cat "$build/configure.log" >&2; exit 1; }
cmake --build "$build" -j "$(nproc)"
