#!/usr/bin/env bash
# The main job on the shipped defaults: the Tidewall demo (integrations/demo/SCENARIO.md; the
# scenario, its names and its data are invented). The shipped demo model proposes candidate
# structures for four compositions it never saw in training (its test split) and de novo
# candidates; every candidate is checked (distances, symmetry, charge balance, toxic and
# radioactive elements), duplicates are grouped, and each run writes CIF, extended XYZ, a
# JSON-lines summary and a self-contained HTML report. Candidates are hypotheses, not
# predictions of stable compounds.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"
out="${1:-$root/out/demo}"
model="$root/integrations/demo/model/demo.nucleate"

"$root/scripts/install-deps.sh"
"$root/scripts/build.sh" -DNUCLEATE_BUILD_TESTS=OFF
nucleate="$build/integrations/cli/nucleate"
mkdir -p "$out"

"$nucleate" version
echo
"$nucleate" model info "$model"
# Held out from training (the test split of integrations/demo/train_demo.yaml): a chalcogenide,
# an oxide, a fluoride and an intermetallic phase of the scenario's screen.
for formula in CaS K2O AgF AlCu; do
  echo
  echo "== Structure prediction for $formula (8 candidates)"
  "$nucleate" sample --model "$model" --composition "$formula" --count 8 --seed 1 \
    --symmetrise --force --out "$out/$formula"
done
echo
echo "== De novo candidates (16; compositions proposed by the model)"
"$nucleate" sample --model "$model" --de-novo --count 16 --seed 1 --force --out "$out/de-novo"
echo
echo "Reports: $out/<run>/report.html (open in a browser); CIF, extended XYZ and summary.jsonl"
echo "beside each. Candidates are hypotheses: confirm them with DFT, and follow local safety"
echo "rules and licensed practice for any element flagged toxic or radioactive."
