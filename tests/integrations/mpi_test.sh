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

# --- Data-parallel training ----------------------------------------------------------------
# The same run on one process and on 2 ranks (each half of every batch): the same steps, and
# predictions of the two models within 1e-4 of each other (relative to the largest; the sums run
# in another order, so bits may differ; core/train/trainer.h).
for name in serial parallel; do
  cat >"data/$name.yaml" <<EOF2
data: {directory: structures}
split: {validation_fraction: 0.2, test_fraction: 0.0}
model: {hidden: 16, layers: 1, time_embedding: 8, species: absorbing}
diffusion: {steps: 20}
training: {epochs: 6, batch_size: 4, micro_batch: 1, warmup_steps: 1, threads: 1}
output: {model: $name.nucleate}
EOF2
done
"$cli" train --config data/serial.yaml >train-serial.out 2>train-serial.err
expect $? "serial training: $(tail -n 1 train-serial.err)"
ranks 2 train --config data/parallel.yaml >train-parallel.out 2>train-parallel.err
expect $? "2-rank training: $(tail -n 1 train-parallel.err)"
[[ $(grep -c '^model written' train-parallel.err) -eq 1 ]] && grep -q 'on each of 2 processes' train-parallel.err
expect $? "2-rank training: one log, naming the 2 processes: $(head -n 4 train-parallel.err)"
grep -q '^parameters .* steps 6$' train-parallel.out && \
  [[ $(grep steps train-serial.out) == "$(grep steps train-parallel.out)" ]]
expect $? "2-rank training: the serial run's epochs and steps: $(grep steps train-parallel.out)"
# Rock salt, primitive cell, half-way through the 20 steps.
cell='{"structure":{"lattice":[0,2.82,2.82,2.82,0,2.82,2.82,2.82,0],"atomic_numbers":[11,17],"frac_coords":[0.01,0.02,0.03,0.5,0.48,0.52]},"step":10}'
for name in serial parallel; do
  echo "{\"model_path\":\"data/$name.nucleate\",\"cells\":[$cell]}" | "$cli" call Evaluate \
    | grep -o -- '-\?[0-9][0-9.e+-]*' >"evaluate-$name.txt"
done
difference=$(paste evaluate-serial.txt evaluate-parallel.txt | awk '
  { d = $1 - $2; if (d < 0) d = -d; if (d > diff) diff = d
    a = $1 < 0 ? -$1 : $1; if (a > scale) scale = a; n++ }
  END { if (n < 10 || scale == 0) print "none"; else printf "%.3g\n", diff / scale }')
[[ $difference != none ]] && awk -v d="$difference" 'BEGIN { exit !(d < 1e-4) }'
expect $? "2-rank training: predictions within 1e-4 of the serial model's (measured $difference)"
echo "data-parallel training: predictions differ by $difference of the largest"

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
