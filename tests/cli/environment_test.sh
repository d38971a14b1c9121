#!/usr/bin/env bash
# The library never reads environment variables to change results (README, "Limits and
# guarantees"). Two proofs:
# 1. libnucleate.so imports none of getenv, secure_getenv, environ or setlocale (nm).
# 2. The same sampling run and check of its candidates, under a bare environment and under
#    variables a cluster sets (OpenMP thread counts: spglib underneath uses OpenMP; locale, time
#    zone, home, and NUCLEATE_* names nobody reads), write the same bytes.
# Usage: environment_test.sh NUCLEATE_EXECUTABLE
set -u

# The shipped demo model, found before the support script moves into its temporary folder.
model=$(realpath "$(dirname "${BASH_SOURCE[0]}")/../../integrations/demo/model/demo.nucleate")
source "$(dirname "${BASH_SOURCE[0]}")/cli_test_support.sh" "$@"

# --- 1. What the library imports -------------------------------------------------------------
library=$(ldd "$cli" | awk '/libnucleate\.so/ {print $3}')
[[ -n "$library" && -f "$library" ]]
expect $? "the CLI loads libnucleate.so (ldd found '$library')"
imports=$(nm -D --undefined-only "$library" | awk '{print $NF}' | sed 's/@.*//')
[[ $(wc -l <<<"$imports") -gt 50 ]]
expect $? "nm lists the library's imports ($(wc -l <<<"$imports") found)"
readers=$(grep -xE 'getenv|secure_getenv|__secure_getenv|environ|__environ|setlocale|uselocale' \
  <<<"$imports")
[[ -z "$readers" ]]
expect $? "libnucleate.so imports no environment or locale reader, found: $readers"

# --- 2. Same bytes whatever the environment -------------------------------------------------
run() {  # run NAME ENV-ASSIGNMENTS...: sample and check under exactly that environment
  local name=$1
  shift
  env -i PATH="$PATH" "$@" "$cli" sample --model "$model" --composition CaS --count 4 \
    --seed 5 --steps 60 --out "$name" >"$name.sample.out" 2>"$name.sample.err"
  expect $? "sample under '$*': $(tail -n 1 "$name.sample.err")"
  env -i PATH="$PATH" "$@" "$cli" check --json "$name"/sample-*.cif >"$name.check.json" \
    2>"$name.check.err"
  expect $? "check under '$*': $(tail -n 1 "$name.check.err")"
}
run bare
run omp_one OMP_NUM_THREADS=1
run omp_many OMP_NUM_THREADS=7 OMP_DYNAMIC=true OMP_PROC_BIND=close
run locale LANG=C.UTF-8 LC_ALL=C.UTF-8 LC_NUMERIC=C.UTF-8 TZ=Pacific/Chatham HOME=/nonexistent
run invented NUCLEATE_THREADS=3 NUCLEATE_SEED=99 NUCLEATE_LOG=debug
[[ $(ls bare/sample-*.cif | wc -l) -eq 4 ]]
expect $? "the bare run wrote 4 CIFs"
for name in omp_one omp_many locale invented; do
  diff -r bare "$name" >/dev/null
  expect $? "files of '$name' equal the bare run's"
  # Both outputs name the run's folder; apart from that, the same bytes.
  cmp -s <(sed "s#$name#bare#g" "$name.sample.out") bare.sample.out
  expect $? "sample table of '$name' equals the bare run's"
  cmp -s <(sed "s#$name/#bare/#g" "$name.check.json") bare.check.json
  expect $? "check report of '$name' equals the bare run's"
done

echo "$checks checks, $failures failed"
[[ $failures -eq 0 ]]
