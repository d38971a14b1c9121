#!/usr/bin/env bash
# Side-by-side benchmark of nucleate's denoiser against the same network in PyTorch on the CPU
# (tests/bench/side_by_side/README.md). One command on Debian 12:
#   scripts/run-side-by-side.sh [THREADS]        (default: all hardware threads)
# It installs the build dependencies (scripts/install-deps.sh) and, for this benchmark only,
# python3-torch and python3-numpy when missing (never a dependency of nucleate itself); builds
# side_by_side_server in build-bench/ (Release, NUCLEATE_BUILD_BENCHMARKS=ON); uses the demo model
# the repository ships, or trains a small one when it is missing; then checks parity and times
# both. Debian's python3-torch calls whatever libblas.so.3 the system provides (the reference
# BLAS unless another is installed), which would time torch's matrix products at a small
# fraction of its usual speed; so torch gets OpenBLAS (libopenblas0-openmp, unpacked into
# build-bench/torch-blas and loaded only by the benchmark's Python process, the system's BLAS
# left as it is). SIDE_BY_SIDE_TORCH_BLAS=system keeps the system's BLAS instead. torch runs with
# OMP_WAIT_POLICY=PASSIVE unless the variable is set (reason below).
# NUCLEATE_BUILD_JOBS sets the build's parallel jobs (default: all hardware threads).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="$root/build-bench"
here="$root/tests/bench/side_by_side"
threads="${1:-$(nproc)}"
jobs="${NUCLEATE_BUILD_JOBS:-$(nproc)}"
torch_blas="${SIDE_BY_SIDE_TORCH_BLAS:-openblas}"
# Debian's interpreter, where python3-torch installs (a python3 earlier on PATH may lack it).
python=/usr/bin/python3

if ! [[ "$threads" =~ ^[1-9][0-9]*$ ]]; then
  echo "run-side-by-side: THREADS must be a whole number >= 1, got '$threads'" >&2
  exit 2
fi
if [ "$torch_blas" != openblas ] && [ "$torch_blas" != system ]; then
  echo "run-side-by-side: SIDE_BY_SIDE_TORCH_BLAS must be 'openblas' or 'system', got '$torch_blas'" >&2
  exit 2
fi

say() { echo "run-side-by-side: $*"; }

# --- packages -----------------------------------------------------------------------------------
"$root/scripts/install-deps.sh"
missing=()
for package in python3-torch python3-numpy; do
  if ! dpkg-query -W -f='${Status}' "$package" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$package")
  fi
done
if [ ${#missing[@]} -gt 0 ]; then
  if [ "$(id -u)" -ne 0 ]; then
    echo "run-side-by-side: missing ${missing[*]} (benchmark only); run as root or install them" >&2
    exit 1
  fi
  say "installing ${missing[*]} (for this benchmark only)"
  DEBIAN_FRONTEND=noninteractive apt-get install -y "${missing[@]}"
fi

# OpenMP threads that spin while waiting fight other work for the cores: on a busy 2-core machine
# torch's 2-thread forward pass was measured 5.5 times slower with spinning (the default) than
# with OMP_WAIT_POLICY=PASSIVE, which torch therefore gets unless the caller chose a policy.
python_env=(env "OMP_WAIT_POLICY=${OMP_WAIT_POLICY:-PASSIVE}")
if [ "$torch_blas" = openblas ]; then
  blas_dir="$build/torch-blas/root/usr/lib/x86_64-linux-gnu/openblas-openmp"
  if [ ! -e "$blas_dir/libblas.so.3" ]; then
    say "fetching OpenBLAS for torch into $build/torch-blas (not installed system-wide)"
    mkdir -p "$build/torch-blas"
    (cd "$build/torch-blas" && rm -f libopenblas0-openmp_*.deb && apt-get download libopenblas0-openmp)
    dpkg-deb -x "$build"/torch-blas/libopenblas0-openmp_*.deb "$build/torch-blas/root"
  fi
  python_env+=("LD_LIBRARY_PATH=$blas_dir${LD_LIBRARY_PATH:+:$LD_LIBRARY_PATH}")
fi

# --- build --------------------------------------------------------------------------------------
mkdir -p "$build"
say "configuring and building side_by_side_server in $build"
cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=Release -DNUCLEATE_BUILD_TESTS=ON \
  -DNUCLEATE_BUILD_BENCHMARKS=ON > "$build/configure.log" 2>&1 \
  || { cat "$build/configure.log" >&2; exit 1; }
cmake --build "$build" -j "$jobs" --target side_by_side_server

# --- model --------------------------------------------------------------------------------------
model="$root/integrations/demo/model/demo.nucleate"
if [ ! -f "$model" ]; then
  work="$build/side-by-side-model"
  model="$work/small.nucleate"
  if [ ! -f "$model" ]; then
    say "the demo model is missing; training a small model in $work"
    cmake --build "$build" -j "$jobs" --target nucleate_cli nucleate_corpus_tool
    mkdir -p "$work"
    "$build/integrations/demo/corpus/nucleate-corpus" --out "$work" --seed 1 --count 400
    cp "$here/train_small.yaml" "$work/train_small.yaml"
    # Progress: one line per step and epoch when not on a terminal.
    "$build/integrations/cli/nucleate" train --config "$work/train_small.yaml" --log "$work/train.log"
  fi
fi
say "model $model"

# --- benchmark ----------------------------------------------------------------------------------
"${python_env[@]}" "$python" "$here/side_by_side.py" --server "$build/tests/bench/side_by_side_server" \
  --model "$model" --threads "$threads" --work "$build/side-by-side"
