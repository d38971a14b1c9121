#!/usr/bin/env bash
# Installs every Debian 12 package nucleate needs to build, test and run its examples, when missing.
# Needs root (apt-get). Without root, see README.md, "Without root on a cluster".
set -euo pipefail

packages=(
  # build
  cmake g++ gfortran make pkg-config
  # libraries
  libeigen3-dev libsymspg-dev libyaml-cpp-dev libprotobuf-dev protobuf-compiler
  libcli11-dev librandom123-dev
  # the MPI driver nucleate-mpi (the library itself never links MPI)
  libopenmpi-dev openmpi-bin
  # tests
  libgtest-dev libbenchmark-dev
  # fuzzing (libFuzzer ships with clang; the sanitizer runtimes of gcc come with g++)
  clang libclang-rt-14-dev
  # outside references used by the tests only (the product itself stays Python-free)
  python3 python3-numpy python3-spglib python3-ase python3-pymatgen
)

missing=()
for package in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$package" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$package")
  fi
done

if [ ${#missing[@]} -eq 0 ]; then
  echo "install-deps: all ${#packages[@]} packages present"
  exit 0
fi

if [ "$(id -u)" -ne 0 ]; then
  echo "install-deps: missing packages: ${missing[*]}" >&2
  echo "install-deps: run as root, or install them through your site's modules (README.md)" >&2
  exit 1
fi

echo "install-deps: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
apt-get install -y -qq --no-install-recommends "${missing[@]}"
