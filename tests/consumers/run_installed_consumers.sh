#!/usr/bin/env bash
# Installs a finished build into a fresh prefix and uses it only as an outsider would:
#   1. libnucleate.so exports nucleate_* and nothing else;
#   2. the public header compiles alone under strict C99 and C++17;
#   3. a find_package project (C and Fortran) builds and passes the ABI tests, the dlopen test
#      and the conformance runners;
#   4. a pkg-config Makefile builds and passes the C and Fortran ABI tests;
#   5. the examples of integrations/examples (the C program, and the Fortran driver) build as
#      their own projects with find_package and run on a tiny model (tests/integrations);
#   6. after the whole prefix is moved elsewhere, pkg-config and find_package still work and
#      every program loads the moved library.
# Usage: run_installed_consumers.sh BUILD_DIR SOURCE_DIR LIBDIR CMAKE CC CXX FC|"" VERSION
#   LIBDIR is CMAKE_INSTALL_LIBDIR; FC empty means the package was built without Fortran.
set -euo pipefail

if [[ $# -ne 8 ]]; then
  echo "usage: $0 BUILD_DIR SOURCE_DIR LIBDIR CMAKE CC CXX FC VERSION" >&2
  exit 2
fi
build=$1 source=$2 libdir=$3 cmake=$4 cc=$5 cxx=$6 fc=$7 version=$8
tests="$source/tests"
fortran=OFF
[[ -n $fc ]] && fortran=ON

work=$(mktemp -d "${TMPDIR:-/tmp}/nucleate-consumers.XXXXXX")
trap 'rm -rf "$work"' EXIT
# Nothing may come from the build tree or the caller's environment.
unset LD_LIBRARY_PATH PKG_CONFIG_PATH CMAKE_PREFIX_PATH || true

step() { echo "== $*"; }
fail() { echo "FAILED: $*" >&2; exit 1; }

# Fails unless `program` resolves libnucleate.so.N inside `prefix`.
check_loads_from() {
  local program=$1 prefix=$2 resolved
  if ldd "$program" | grep -q 'libnucleate.*not found'; then
    fail "$program cannot find a nucleate library without LD_LIBRARY_PATH:"$'\n'"$(ldd "$program")"
  fi
  resolved=$(ldd "$program" | awk '/libnucleate\.so/ {print $3}')
  [[ -n $resolved ]] || fail "$program does not load libnucleate: $(ldd "$program")"
  while read -r path; do
    [[ $(realpath "$path") == "$(realpath "$prefix")"/* ]] ||
      fail "$program loads $path, not a library below $prefix"
  done <<<"$resolved"
}

# Runs a conformance runner as tests/conformance/README.md says: in a folder with a `data` link to
# the committed conformance data (requests name data/tiny.nucleate; Train writes there).
in_conformance_folder() {
  local folder="$work/conformance-run"
  mkdir -p "$folder"
  [[ -e $folder/data ]] || ln -s "$tests/conformance/data" "$folder/data"
  (cd "$folder" && "$@")
}

# Configures, builds and runs the find_package consumer against `prefix`.
run_find_package_consumer() {
  local prefix=$1 out=$2 cases="$tests/conformance/cases"
  "$cmake" -S "$tests/consumers/find_package" -B "$out" -DCMAKE_PREFIX_PATH="$prefix" \
    -DCMAKE_FIND_USE_PACKAGE_REGISTRY=OFF -DCMAKE_C_COMPILER="$cc" \
    ${fc:+-DCMAKE_Fortran_COMPILER="$fc"} -DNUCLEATE_CONSUMER_FORTRAN="$fortran" \
    -DNUCLEATE_EXPECTED_PREFIX="$prefix" -DNUCLEATE_EXPECTED_VERSION="$version" >"$out.log" ||
    { cat "$out.log"; fail "find_package consumer: configure"; }
  "$cmake" --build "$out" >>"$out.log" 2>&1 || { cat "$out.log"; fail "find_package consumer: build"; }
  check_loads_from "$out/c_call_test" "$prefix"
  "$out/c_call_test"
  "$out/dlopen_plugin_test" "$prefix/$libdir/libnucleate.so"
  in_conformance_folder "$out/run_conformance" "$cases"
  in_conformance_folder "$out/run_conformance_plugin" "$prefix/$libdir/libnucleate.so" "$cases"
  if [[ $fortran == ON ]]; then
    check_loads_from "$out/fortran_schedule_test" "$prefix"
    "$out/fortran_schedule_test"
    "$out/fortran_structure_test"
    find "$cases" -mindepth 1 -maxdepth 1 -type d -printf '%f\n' | sort >"$out/cases.txt"
    in_conformance_folder "$out/run_conformance_fortran" "$cases" "$out/cases.txt"
  fi
}

# Builds each example of integrations/examples as the project a user would copy, against
# `prefix`, and runs them on a tiny model trained with the installed command-line tool.
run_examples() {
  local prefix=$1 out=$2 examples="$source/integrations/examples" driver=""
  "$cmake" -S "$examples/c" -B "$out/c" -DCMAKE_PREFIX_PATH="$prefix" \
    -DCMAKE_FIND_USE_PACKAGE_REGISTRY=OFF -DCMAKE_C_COMPILER="$cc" >"$out.log" ||
    { cat "$out.log"; fail "C example: configure"; }
  "$cmake" --build "$out/c" >>"$out.log" 2>&1 || { cat "$out.log"; fail "C example: build"; }
  check_loads_from "$out/c/sample_candidates" "$prefix"
  if [[ $fortran == ON ]]; then
    "$cmake" -S "$examples/fortran_driver" -B "$out/fortran" -DCMAKE_PREFIX_PATH="$prefix" \
      -DCMAKE_FIND_USE_PACKAGE_REGISTRY=OFF -DCMAKE_Fortran_COMPILER="$fc" >>"$out.log" ||
      { cat "$out.log"; fail "Fortran driver: configure"; }
    "$cmake" --build "$out/fortran" >>"$out.log" 2>&1 ||
      { cat "$out.log"; fail "Fortran driver: build"; }
    check_loads_from "$out/fortran/dft_candidates" "$prefix"
    driver="$out/fortran/dft_candidates"
  fi
  bash "$tests/integrations/examples_test.sh" "$prefix/bin/nucleate" "$out/c/sample_candidates" \
    "$driver" || fail "the examples against $prefix"
}

# Builds and runs the pkg-config consumer against `prefix`.
run_pkg_config_consumer() {
  local prefix=$1 out=$2 goals=c
  [[ $fortran == ON ]] && goals="c fortran"
  mkdir -p "$out"
  PKG_CONFIG_PATH="$prefix/$libdir/pkgconfig" make -s -f "$tests/consumers/pkg_config/Makefile" \
    OUT="$out" CC="$cc" FC="${fc:-false}" $goals || fail "pkg-config consumer: build"
  check_loads_from "$out/c_call_test" "$prefix"
  "$out/c_call_test"
  if [[ $fortran == ON ]]; then
    check_loads_from "$out/fortran_schedule_test" "$prefix"
    "$out/fortran_schedule_test"
    "$out/fortran_structure_test"
  fi
}

prefix="$work/prefix"
step "install $build into $prefix"
"$cmake" --install "$build" --prefix "$prefix" >"$work/install.log" ||
  { cat "$work/install.log"; fail "cmake --install"; }
library="$prefix/$libdir/libnucleate.so"
[[ -e $library ]] || fail "no $library"

step "exported symbols of $library"
# Linker-made symbols are tolerated (none are expected with the version script); anything else
# that is not nucleate_* means a C++ or protobuf symbol leaked.
linker_made='^(_init|_fini|_edata|_end|__bss_start)$'
others=$(nm -D --defined-only "$library" | awk '{print $NF}' | grep -v '^nucleate_' || true)
exported=$(nm -D --defined-only "$library" | awk '{print $NF}' | grep -c '^nucleate_' || true)
[[ $exported -gt 0 ]] || fail "no nucleate_* symbol exported"
echo "$exported nucleate_* symbols"
if [[ -n $others ]]; then
  echo "other exported symbols:"
  echo "$others" | sed 's/^/  /'
  leaked=$(echo "$others" | grep -Ev "$linker_made" || true)
  [[ -z $leaked ]] || fail "symbols other than nucleate_* are exported"
fi

step "public header alone, strict C99 and C++17"
"$cc" -std=c99 -pedantic -Wall -Wextra -Werror -I"$prefix/include" \
  -c "$tests/abi/header_pedantic.c" -o "$work/header_c.o"
"$cxx" -x c++ -std=c++17 -pedantic -Wall -Wextra -Werror -I"$prefix/include" \
  -c "$tests/abi/header_pedantic.c" -o "$work/header_cxx.o"

step "installed command-line tool"
check_loads_from "$prefix/bin/nucleate" "$prefix"
"$prefix/bin/nucleate" version | grep -qF "nucleate $version " || fail "bin/nucleate version"
in_conformance_folder bash "$tests/conformance/run_conformance_cli.sh" "$prefix/bin/nucleate" \
  "$tests/conformance/cases"

step "find_package consumer"
run_find_package_consumer "$prefix" "$work/find_package"

step "pkg-config consumer"
run_pkg_config_consumer "$prefix" "$work/pkg_config"

step "examples (integrations/examples) as their own projects"
run_examples "$prefix" "$work/examples"

moved="$work/elsewhere/moved-prefix"
step "move the prefix to $moved"
mkdir -p "$(dirname "$moved")"
mv "$prefix" "$moved"
[[ $(PKG_CONFIG_PATH="$moved/$libdir/pkgconfig" pkg-config --variable=libdir nucleate) -ef \
   "$moved/$libdir" ]] || fail "pkg-config libdir does not follow the moved prefix"

step "pkg-config consumer against the moved prefix"
run_pkg_config_consumer "$moved" "$work/pkg_config_moved"

step "find_package consumer against the moved prefix"
run_find_package_consumer "$moved" "$work/find_package_moved"

step "installed command-line tool after the move"
check_loads_from "$moved/bin/nucleate" "$moved"
"$moved/bin/nucleate" version | grep -qF "nucleate $version " || fail "moved bin/nucleate version"

echo "installed consumers: all passed"
