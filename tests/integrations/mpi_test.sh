#!/usr/bin/env bash
# nucleate-mpi against the serial command line: with 2 (and 3) ranks on this machine, `mpirun -n P
# nucleate-mpi sample ...` must write the same files, byte for byte, as `nucleate sample ...`
# with the same flags, duplicates grouped across ranks; refusals come once, from rank 0.
# Usage: mpi_test.sh NUCLEATE NUCLEATE_MPI MPIEXEC
mpi_driver=$(realpath "$2")  # before the support script moves into its temporary folder
mpiexec=$3
source "$(dirname "${BASH_SOURCE[0]}")/../cli/cli_test_support.sh" "$1"
# CI runs as root; OpenMPI refuses root unless told, and CI machines may have fewer cores than
# ranks (--oversubscribe).
if [[ $(id -u) -eq 0 ]]; then
  export OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1
fi
ranks() {
  local n=$1
  shift
  "$mpiexec" --oversubscribe -n "$n" "$mpi_driver" "$@"
}

# --- A tiny model -------------------------------------------------------------------------------
# Primitive rock-salt cells (a / sqrt 2 at 60 degrees); lattice constants from memory.
mkdir -p data/structures
for entry in "Na Cl 3.988" "K Cl 4.448" "Li F 2.850" "Mg O 2.977" "Ca O 3.401"; do
  read -r a b constant <<<"$entry"
  write_cif "data/structures/$a$b.cif" "$a$b" "$constant" 60 "$a 0 0 0" "$b 0.5 0.5 0.5"
done
cat >data/tiny.yaml <<EOF2
data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 16, layers: 1, time_embedding: 8, species: absorbing}
diffusion: {steps: 20}
training: {epochs: 2, batch_size: 4, micro_batch: 1, warmup_steps: 1}
output: {model: tiny.nucleate}
EOF2
"$cli" train --config data/tiny.yaml >train.out 2>train.err
expect $? "train the tiny model: $(tail -n 1 train.err)"
model=data/tiny.nucleate

# same_as_serial NAME RANKS FLAGS...: both runs succeed and their out folders and stdout agree.
same_as_serial() {
  local name=$1 n=$2
  shift 2
  "$cli" sample --model $model --out "serial-$name" "$@" >"serial-$name.out" 2>/dev/null
  local serial_code=$?
  ranks "$n" sample --model $model --out "mpi-$name" "$@" >"mpi-$name.out" 2>"mpi-$name.err"
  local mpi_code=$?
  [[ $serial_code -eq 0 && $mpi_code -eq 0 ]]
  expect $? "$name: both runs succeed (serial $serial_code, $n ranks $mpi_code): $(cat "mpi-$name.err")"
  diff -r "serial-$name" "mpi-$name" >"diff-$name.txt"
  expect $? "$name: the $n-rank files equal the serial files byte for byte: $(head -n 5 "diff-$name.txt")"
  diff <(sed "s/serial-$name/OUT/" "serial-$name.out") <(sed "s/mpi-$name/OUT/" "mpi-$name.out") \
    >/dev/null
  expect $? "$name: the $n-rank table equals the serial table"
}

same_as_serial composition 2 --composition NaCl --count 7 --seed 3
[[ $(find mpi-composition -name 'sample-*.cif' | wc -l) -eq 7 ]]
expect $? "composition: 7 candidate files"
# Small variations of one structure: all 6 candidates are one crystal, so ranks 0 and 1 hold
# members of the same group and only the merge can group them.
same_as_serial variation 2 --vary data/structures/NaCl.cif --strength 0.05 --count 6 --seed 3
grep -q ' 1 unique' mpi-variation.out
expect $? "variation: one duplicate group across both ranks: $(tail -n 2 mpi-variation.out)"
same_as_serial offset 2 --composition MgO --count 5 --first-index 11 --seed 4 --json
same_as_serial idle-rank 3 --composition NaCl --count 2 --seed 3

# --- Refusals: once, from rank 0 ------------------------------------------------------------
ranks 2 sample --model missing.nucleate --composition NaCl --count 4 --out refused \
  >/dev/null 2>refused.err
code=$?
[[ $code -ne 0 && $(grep -c 'missing.nucleate' refused.err) -eq 1 ]] &&
  grep -q 'on MPI rank 0 of 2' refused.err && [[ ! -e refused ]]
expect $? "a missing model: non-zero exit, one message naming the file and rank, no folder (exit $code): $(cat refused.err)"
ranks 2 sample --model $model --composition NaCl --no-such-flag --out refused >/dev/null 2>usage.err
code=$?
[[ $code -ne 0 && $(grep -c 'no-such-flag' usage.err) -eq 1 ]]
expect $? "an unknown flag: non-zero exit and one message (exit $code): $(cat usage.err)"

echo "MPI test: $((checks - failures)) of $checks checks passed"
[[ $failures -eq 0 ]]
