#!/usr/bin/env bash
# `nucleate assess` end to end, as a user runs it: train tiny models with `nucleate train` on a
# folder of two-atom ionic cells with a test split, then assess them from the training
# configuration and from structure files, and check the table, the JSON reply, the held-out set,
# reproducibility, the refusals and Ctrl-C. Plain bash and the CLI itself (no jq, no Python).
# Tiny models learn nothing in 2 epochs; the figures' values are tested in tests/unit/assess, here
# the plumbing and the sample sizes.
# Usage: assess_command_test.sh NUCLEATE_EXECUTABLE
set -u

source "$(dirname "${BASH_SOURCE[0]}")/cli_test_support.sh" "$@"

# --- The data and two tiny models -----------------------------------------------------------
# Primitive rock-salt cells (constant a / sqrt 2 at 60 degrees) and CsCl-type cells; lattice
# constants from memory (handbook values), sizes as tests/cli/sample_command_test.sh.
mkdir -p data/structures
for entry in "Na Cl 3.988" "K Cl 4.448" "Li F 2.850" "Mg O 2.977" "Na F 3.277" "K Br 4.667" \
  "Ca O 3.401" "Li Cl 3.635"; do
  read -r a b constant <<<"$entry"
  write_cif "data/structures/$a$b.cif" "$a$b" "$constant" 60 "$a 0 0 0" "$b 0.5 0.5 0.5"
done
for entry in "Cs Cl 4.12" "Cs Br 4.29" "Tl Cl 3.84" "Cs I 4.57"; do
  read -r a b constant <<<"$entry"
  write_cif "data/structures/$a$b.cif" "$a$b" "$constant" 90 "$a 0 0 0" "$b 0.5 0.5 0.5"
done
for kind in absorbing given; do
  cat >"data/$kind.yaml" <<EOF
data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.3}
model: {hidden: 16, layers: 1, time_embedding: 8, species: $kind}
diffusion: {steps: 20}
training: {epochs: 2, batch_size: 4, micro_batch: 1, warmup_steps: 1}
output: {model: $kind.nucleate}
EOF
  "$cli" train --config "data/$kind.yaml" >"train-$kind.out" 2>"train-$kind.err"
  expect $? "train the $kind model: $(tail -n 1 "train-$kind.err")"
done
if [[ $failures -gt 0 ]]; then
  echo "no models, no assessment: $failures failed"
  exit 1
fi
model=data/absorbing.nucleate
test_count=$(sed -n 's/.*, test \([0-9]*\)$/\1/p' train-absorbing.out)

# --- From the training configuration ---------------------------------------------------------
# Source: schemas/nucleate/v1/assess.proto, AssessRequest.config_yaml: the test split of the
# configuration is held out; AssessReply: every figure with its sample size; the caution.
"$cli" assess --model $model --config data/absorbing.yaml --candidates 3 --de-novo 4 --seed 5 \
  --log assess.log >table.out 2>table.err
expect $? "assess from the configuration exits 0: $(tail -n 1 table.err)"
[[ $(head -n 1 table.out) == *hypotheses* ]]
expect $? "stdout starts with the caution: $(head -n 1 table.out)"
grep -q "^held out: $test_count structures" table.out
expect $? "the held-out set is the $test_count cells of the test split that train reported: $(grep '^held out' table.out)"
grep -q 'dataset hash [0-9a-f]*\.\.\. verified' table.out
expect $? "the table says the dataset hash was verified"
grep -q '^metric  *value  *sample size$' table.out
expect $? "the metric table has its header"
for metric in 'match rate, 1 candidate' 'match rate, 3 candidates' 'validity (min distance' \
  'charge neutrality' 'space group above P-1' 'uniqueness' 'novelty against the training set' \
  'density distance (W1' 'element-count distance (W1' 'de novo: validity' \
  'de novo: charge neutrality' 'de novo: uniqueness' 'de novo: novelty'; do
  grep -q "^$metric" table.out
  expect $? "the table has a row '$metric'"
done
grep -q '^de novo: validity.*of 4 finished candidates$' table.out
expect $? "de novo validity is given of its 4 candidates: $(grep '^de novo: validity' table.out)"
grep -q '^progress 100%' assess.log && grep -q '^match rate, 1 candidate' assess.log
expect $? "--log holds progress lines and the table"

"$cli" assess --model $model --config data/absorbing.yaml --candidates 3 --de-novo 4 --seed 5 \
  --json >reply.json 2>/dev/null
expect $? "--json exits 0"
[[ $(wc -l <reply.json) -eq 1 && $(head -c 1 reply.json) == "{" ]]
expect $? "--json prints one JSON object"
[[ $(json_value held_out_structures <reply.json) == "$test_count" ]]
expect $? "held_out_structures is the test count $test_count: $(json_value held_out_structures <reply.json)"
assessed=$(grep -o '"formula":"[A-Za-z]*","formula_units"' reply.json | wc -l)
skipped=$(grep -o '"reason":"' reply.json | wc -l)
[[ $assessed -ge 1 && $((assessed + skipped)) -eq $(json_value held_out_compositions <reply.json) ]]
expect $? "every held-out composition is assessed ($assessed) or skipped with a reason ($skipped)"
# Sample sizes: K x compositions candidates, of which each rate is counted.
prediction=$(grep -o '"prediction":{[^}]*}' reply.json)
[[ $(json_value requested <<<"$prediction") == $((3 * assessed)) ]]
expect $? "structure prediction requested 3 x $assessed candidates: $prediction"
grep -q '"valid":{"count":"[0-9]*","total":"'$((3 * assessed))'"' reply.json
expect $? "validity is counted of the $((3 * assessed)) candidates"
grep -q '"de_novo_run":true,"de_novo":{"requested":"4","finished":"4"' reply.json
expect $? "the de novo part ran its 4 candidates"
grep -q '"caution":"Candidates are hypotheses' reply.json
expect $? "the reply carries the caution"

# --- Reproducibility -------------------------------------------------------------------------
# Source: assess.proto, AssessRequest.seed: "the figures depend on the seed, never on the thread
# count".
for threads in 1 2; do
  "$cli" assess --model $model --config data/absorbing.yaml --candidates 3 --de-novo 4 --seed 5 \
    --threads $threads --json >"threads$threads.json" 2>/dev/null
done
cmp -s threads1.json threads2.json && cmp -s reply.json threads1.json
expect $? "--threads 1, --threads 2 and the default give the same reply"

# --- De novo with a model that takes species as given ---------------------------------------
"$cli" assess --model data/given.nucleate --config data/given.yaml --candidates 1 --de-novo 3 \
  >given.out 2>given.err
expect $? "assessing the given-species model exits 0: $(tail -n 1 given.err)"
grep -q 'de novo candidates skipped: the model takes species as given' given.out && \
  ! grep -q '^de novo:' given.out
expect $? "de novo is skipped with a note, without de novo rows"

# --- From structure files --------------------------------------------------------------------
"$cli" assess --model $model --held-out data/structures/NaCl.cif data/structures/KCl.cif \
  --training data/structures/LiF.cif --candidates 2 --json >files.json 2>files.err
expect $? "assess from --held-out files exits 0: $(tail -n 1 files.err)"
[[ $(json_value held_out_structures <files.json) == 2 && $(json_value training_structures <files.json) == 1 ]]
expect $? "2 held-out and 1 training structure from the files"
grep -q '"target":"data/structures/KCl.cif#KCl"' files.json
expect $? "rows name the target by file and block"

# --- A configuration that does not rebuild the model's split ---------------------------------
# Source: assess.proto: "The rebuilt training split must have the dataset hash the model records,
# or the call is refused". NaCl is a training cell (not among the held-out compositions), so
# dropping it changes the training split.
if grep -q '"formula":"ClNa"' reply.json; then
  expect 1 "precondition: NaCl should be a training composition"
fi
mkdir -p other
cp -r data/structures other/ && rm other/structures/NaCl.cif && cp data/absorbing.yaml other/
"$cli" assess --model $model --config other/absorbing.yaml >/dev/null 2>other.err
code=$?
[[ $code -eq 1 && $(wc -l <other.err) -eq 1 ]] && grep -q 'data: the training split rebuilt' other.err
expect $? "another training split is refused naming data (exit $code): $(cat other.err)"

# --- Bad input -------------------------------------------------------------------------------
# Source: README.md, exit 2 on a command-line mistake, 1 when the library refused.
"$cli" assess --model $model --config data/absorbing.yaml --candidates 0 >/dev/null 2>bad.err
code=$?
[[ $code -eq 1 && $(wc -l <bad.err) -eq 1 ]] && grep -q 'candidates_per_composition' bad.err \
  && grep -q -- '--candidates' bad.err
expect $? "--candidates 0: exit 1 naming the field and the flag (exit $code): $(cat bad.err)"
"$cli" assess --model $model --config data/absorbing.yaml --candidates x >/dev/null 2>bad.err
code=$?
[[ $code -eq 2 ]] && grep -q -- '--candidates' bad.err
expect $? "--candidates x: exit 2 naming the flag (exit $code): $(cat bad.err)"
"$cli" assess --model $model >/dev/null 2>bad.err
code=$?
[[ $code -eq 2 ]] && grep -q -- '--config' bad.err
expect $? "no held-out set: exit 2 naming --config (exit $code): $(cat bad.err)"
"$cli" assess --model $model --config data/absorbing.yaml --held-out data/structures/NaCl.cif \
  >/dev/null 2>bad.err
code=$?
[[ $code -eq 2 ]]
expect $? "--config with --held-out: exit 2 (exit $code): $(cat bad.err)"
"$cli" assess --model missing.nucleate --config data/absorbing.yaml >/dev/null 2>bad.err
code=$?
[[ $code -eq 1 && $(wc -l <bad.err) -eq 1 ]] && grep -q 'missing.nucleate' bad.err
expect $? "a missing model file: exit 1 naming it (exit $code): $(cat bad.err)"

# --- Ctrl-C ----------------------------------------------------------------------------------
# A run far longer than the test (20000 candidates per composition on one thread) is
# interrupted once the log shows progress: exit 1, the message, and the table of what finished.
"$cli" assess --model $model --config data/absorbing.yaml --candidates 20000 --threads 1 \
  --log cancel.log >cancel.out 2>cancel.err &
interrupt_when_progressing $! cancel.log
code=$?
[[ $code -eq 1 ]] && grep -q 'assessment cancelled' cancel.err && grep -q '^metric' cancel.out
expect $? "Ctrl-C: exit 1, a message and the table (exit $code): $(cat cancel.err)"
grep -q '^  cancelled: the figures cover' cancel.out
expect $? "the table's notes say the run was cancelled"

echo "assess command test: $((checks - failures)) of $checks checks passed"
[[ $failures -eq 0 ]]
