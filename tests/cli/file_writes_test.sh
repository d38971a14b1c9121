#!/usr/bin/env bash
# No write outside the paths the caller named (README, "Limits and guarantees"). A shim preloaded
# into the process (record_writes.c) logs every call that creates, writes, renames, links or
# removes a file. Training may touch only the model and checkpoint files its configuration names
# (each written as NAME.tmp, then renamed); sampling only inside its --out folder; checking,
# matching and describing a model write nothing at all.
# Usage: file_writes_test.sh NUCLEATE_EXECUTABLE RECORD_WRITES_SHIM
set -u

shim=$(realpath "$2")
set -- "$1"
source "$(dirname "${BASH_SOURCE[0]}")/cli_test_support.sh" "$@"
log="$work/writes.log"

recorded() {  # recorded NAME COMMAND...: runs the command with the shim; its writes in NAME.writes
  local name=$1
  shift
  rm -f "$log"
  LD_PRELOAD="$shim" NUCLEATE_TEST_WRITE_LOG="$log" "$@" >"$name.out" 2>"$name.err"
  expect $? "$name runs: $(tail -n 1 "$name.err")"
  if [[ -f "$log" ]]; then mv "$log" "$name.writes"; else : >"$name.writes"; fi
}

# The shim works: a plain shell redirection through a preloaded process is seen.
LD_PRELOAD="$shim" NUCLEATE_TEST_WRITE_LOG="$log" touch "$work/probe"
grep -q "probe" "$log"
expect $? "the shim records a write by touch"
rm -f "$log"

# --- Training ---------------------------------------------------------------------------------
# Rock-salt NaCl and CsCl-type CsCl, lattice constants from memory (as sample_command_test.sh).
mkdir -p structures models
write_cif structures/NaCl.cif NaCl 3.98808 60 "Na 0 0 0" "Cl 0.5 0.5 0.5"
write_cif structures/CsCl.cif CsCl 4.12 90 "Cs 0 0 0" "Cl 0.5 0.5 0.5"
cat >train.yaml <<YAML
data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 16, layers: 1, time_embedding: 8}
diffusion: {steps: 20}
training: {epochs: 2, batch_size: 2, micro_batch: 1, warmup_steps: 1, checkpoint_every_epochs: 1}
output: {model: models/tiny.nucleate, checkpoint: models/run.checkpoint}
YAML
recorded train "$cli" train --config train.yaml
[[ -s models/tiny.nucleate && -s models/run.checkpoint ]]
expect $? "training wrote the model and the checkpoint"
# only_paths NAME PATTERN...: every path NAME.writes names matches one of the shell patterns.
only_paths() {
  local name=$1 call first second path absolute pattern ok outside=0
  shift
  while IFS=$'\t' read -r call first second; do
    for path in "$first" ${second:+"$second"}; do
      absolute=$(realpath -m "$path")
      ok=1
      for pattern in "$@"; do
        # shellcheck disable=SC2053 # the pattern is meant to glob
        [[ "$absolute" == $pattern ]] && ok=0
      done
      if [[ $ok -ne 0 ]]; then
        echo "  $name wrote outside the paths it was given: $call $path"
        outside=$((outside + 1))
      fi
    done
  done <"$name.writes"
  return $outside
}
only_paths train "$work/models/tiny.nucleate" "$work/models/run.checkpoint" \
  "$work/models/tiny.nucleate.tmp" "$work/models/run.checkpoint.tmp"
expect $? "training's $(wc -l <train.writes) writes all touch the named model or checkpoint"
[[ $(wc -l <train.writes) -ge 4 ]]
expect $? "training's writes were recorded (model and checkpoint, each created and renamed)"
grep -q $'^rename\t.*models/tiny.nucleate.tmp\t.*models/tiny.nucleate$' train.writes
expect $? "the model is written under a temporary name, then renamed"

# --- Methods that only read --------------------------------------------------------------------
recorded check "$cli" check --json structures/NaCl.cif structures/CsCl.cif
recorded match "$cli" match structures/NaCl.cif structures/NaCl.cif
recorded info "$cli" model info models/tiny.nucleate
for name in check match info; do
  [[ ! -s $name.writes ]]
  expect $? "$name writes nothing, wrote: $(tr '\n' ' ' <"$name.writes")"
done

# Sampling writes the candidates where --out says, and nowhere else.
recorded sample "$cli" sample --model models/tiny.nucleate --composition NaCl --count 2 --seed 3 \
  --out picked
[[ -s picked/sample-0.cif ]]
expect $? "sampling wrote its candidates into picked/"
only_paths sample "$work/picked" "$work/picked/*"
expect $? "sampling's $(wc -l <sample.writes) writes are all inside --out picked"

echo "$checks checks, $failures failed"
[[ $failures -eq 0 ]]
