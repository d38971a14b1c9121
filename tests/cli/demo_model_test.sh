#!/usr/bin/env bash
# The shipped demo model (integrations/demo/model/demo.nucleate) still works: a small batch
# sampled with fixed seeds must clear floors set well under what was measured when the model
# shipped (the figures beside each check; integrations/demo/model/PROVENANCE.md has the full
# assessment). A broken model file, sampler or check fails here.
# Usage: demo_model_test.sh NUCLEATE MODEL
model=$(realpath "$2")
source "$(dirname "${BASH_SOURCE[0]}")/cli_test_support.sh" "$1"

"$cli" model info "$model" >info.txt 2>info.err
expect $? "the shipped model loads and passes its checksum: $(cat info.err)"
grep -q '^parameters 518992 ' info.txt
expect $? "the shipped model has the shipped size: $(head -n 2 info.txt)"

# count_in RUN PATTERN: candidates of a run whose summary line matches PATTERN.
count_in() { grep -c -- "$2" "$1/summary.jsonl"; }

# Structure prediction for held-out compositions (the model's test split), 8 candidates each.
# Space groups from the International Tables: rock salt Fm-3m (225), CsCl type Pm-3m (221).
for formula in CaS BaSe AlCu K2O; do
  "$cli" sample --model "$model" --composition $formula --count 8 --seed 7 --out $formula \
    >/dev/null 2>"$formula.err"
  expect $? "sampling $formula: $(tail -n 1 "$formula.err")"
done
rock_salt_cas=$(count_in CaS '"space_group_number":225,')
expect $(( rock_salt_cas >= 6 ? 0 : 1 )) "CaS: rock salt (225) in at least 6 of 8 (measured 8), got $rock_salt_cas"
rock_salt_base=$(count_in BaSe '"space_group_number":225,')
expect $(( rock_salt_base >= 6 ? 0 : 1 )) "BaSe: rock salt (225) in at least 6 of 8 (measured 8), got $rock_salt_base"
cscl_alcu=$(count_in AlCu '"space_group_number":221,')
expect $(( cscl_alcu >= 5 ? 0 : 1 )) "AlCu: CsCl type (221) in at least 5 of 8 (measured 7), got $cscl_alcu"
valid=0
for formula in CaS BaSe AlCu K2O; do valid=$((valid + $(count_in $formula '"valid":true'))); done
expect $(( valid >= 28 ? 0 : 1 )) "composition given: at least 28 of 32 valid (measured 32), got $valid"

# De novo: the model proposes the compositions too.
"$cli" sample --model "$model" --de-novo --count 16 --seed 7 --out de-novo >/dev/null 2>dn.err
expect $? "de novo sampling: $(tail -n 1 dn.err)"
too_close=$(grep -c '"code":"\(min_distance\|covalent_overlap\)"' de-novo/summary.jsonl)
expect $(( too_close <= 6 ? 0 : 1 )) "de novo: at most 6 of 16 with atoms too close (measured 3), got $too_close"
valid=$(count_in de-novo '"valid":true')
expect $(( valid >= 8 ? 0 : 1 )) "de novo: at least 8 of 16 valid (measured 12), got $valid"

echo "demo model test: $((checks - failures)) of $checks checks passed"
[[ $failures -eq 0 ]]
