#!/usr/bin/env bash
# The C example and the Fortran driver of integrations/examples, run on a tiny model and checked
# against the command-line tool, which builds its requests as JSON on its own path through the
# library: the same candidates must come out. Run by ctest against the build tree, and by
# tests/consumers/run_installed_consumers.sh against the examples built from an installed package.
# Usage: examples_test.sh NUCLEATE_CLI SAMPLE_CANDIDATES DFT_CANDIDATES|""
#   An empty DFT_CANDIDATES skips the Fortran driver (a package built without Fortran).
set -u

if [[ $# -ne 3 ]]; then
  echo "usage: $0 NUCLEATE_CLI SAMPLE_CANDIDATES DFT_CANDIDATES|\"\"" >&2
  exit 2
fi
cli=$(realpath "$1")
sample_candidates=$(realpath "$2")
dft_candidates=""
[[ -n $3 ]] && dft_candidates=$(realpath "$3")
source "$(dirname "${BASH_SOURCE[0]}")/tiny_model.sh"
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 1

train_tiny_model "$cli" tiny
model=tiny/model.nucleate

# --- The C example ------------------------------------------------------------------------------
"$sample_candidates" $model NaCl 7 0 6 c_out >c.tsv 2>c.err
expect $? "sample_candidates exits 0: $(tail -n 2 c.err)"
"$cli" sample --model $model --composition NaCl --count 6 --seed 7 --out cli_out >/dev/null 2>&1
expect $? "nucleate sample, the reference run"
for i in 0 1 2 3 4 5; do
  if [[ -f cli_out/sample-$i.cif ]]; then
    # The same structure written by the library's Convert; only the comment lines differ (the
    # CLI wraps the caution).
    cmp -s <(grep -v '^#' cli_out/sample-$i.cif) <(grep -v '^#' c_out/sample-$i.cif)
    expect $? "c_out/sample-$i.cif holds the CLI's candidate $i"
    head -n 1 c_out/sample-$i.cif | grep -q '^# .*hypotheses'
    expect $? "c_out/sample-$i.cif opens with the caution"
  else
    [[ -f c_out/sample-$i.failed ]]
    expect $? "candidate $i failed in the CLI run and has c_out/sample-$i.failed"
  fi
done
[[ $(grep -c . c.tsv) -eq 7 ]] && head -n 1 c.tsv | grep -q '^# .*hypotheses'
expect $? "stdout: the caution, then 6 candidate lines: $(cat c.tsv)"
[[ $(grep -c $'\tvalid\t' c.tsv) -eq $(grep -c '"valid":true' cli_out/summary.jsonl) ]]
expect $? "as many valid candidates as the CLI found"
grep -q '^progress: sample 100%$' c.err
expect $? "plain progress lines on stderr: $(head -n 3 c.err)"

"$sample_candidates" $model NaCaCl 7 0 2 bad >/dev/null 2>bad.err
code=$?
[[ $code -eq 1 ]] && grep -q 'NUCLEATE_ERROR_INVALID_ARGUMENT' bad.err &&
  grep -q 'composition.formula' bad.err
expect $? "an element outside the model: exit 1 ($code), the status and the field: $(cat bad.err)"
"$sample_candidates" missing.nucleate NaCl 7 0 2 bad >/dev/null 2>bad.err
[[ $? -eq 1 ]] && grep -q 'NUCLEATE_ERROR_IO' bad.err
expect $? "a missing model is an I/O error: $(cat bad.err)"
"$sample_candidates" $model NaCl 7 0 0 bad >/dev/null 2>bad.err
[[ $? -eq 2 ]] && grep -q "COUNT must be a whole number from 1" bad.err
expect $? "COUNT 0 is a usage error: $(cat bad.err)"

# --- The Fortran driver --------------------------------------------------------------------------
if [[ -n $dft_candidates ]]; then
  cat >job.nml <<'EOF_JOB'
&job
  model = 'tiny/model.nucleate'
  formula = 'NaCl'
  formula_units = 2
  count = 6
  seed = 7
  output_prefix = 'nacl'
/
EOF_JOB
  "$dft_candidates" job.nml >driver.out 2>driver.err
  expect $? "dft_candidates exits 0: $(cat driver.err)"
  "$cli" sample --model $model --composition NaCl --formula-units 2 --count 6 --seed 7 \
    --out cli_fu2 >/dev/null 2>&1
  expect $? "nucleate sample with 2 formula units, the reference run"
  # The indices the CLI found valid, and every finished candidate's frame (its extended XYZ).
  valid_indices=$(grep '"valid":true' cli_fu2/summary.jsonl | sed 's/^{"index":\([0-9]*\),.*/\1/' |
    paste -sd ' ')
  [[ -n $valid_indices ]]
  expect $? "the reference run has valid candidates to compare with"
  blocks=$(grep '^! candidate ' nacl.cells | sed 's/^! candidate \([0-9]*\) .*/\1/' | paste -sd ' ')
  [[ $blocks == "$valid_indices" ]]
  expect $? "one block per valid candidate: blocks '$blocks', valid '$valid_indices'"
  grep -q '^! They are hypotheses' nacl.cells
  expect $? "the file says that candidates are hypotheses"
  grep -q "written to nacl.cells" driver.out
  expect $? "the driver names its output: $(cat driver.out)"
  # Every block: 3 cell vectors and 4 atoms (2 Na, 2 Cl), finite numbers, equal within 1e-9 A to
  # the CLI's extended XYZ frame of the same candidate (Lattice="..." and the atom lines).
  awk -v tolerance=1e-9 '
    function finite(x) { return x ~ /^-?[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?$/ }
    function bad(why) { print "block " index_ ": " why; failed = 1 }
    FNR == 1 { file++ }
    file == 1 && /Lattice=/ {  # the reference frames, by label
      match($0, /label="sample-[0-9]+"/); label = substr($0, RSTART + 14, RLENGTH - 15)
      match($0, /Lattice="[^"]*"/); split(substr($0, RSTART + 9, RLENGTH - 10), numbers, " ")
      for (k = 1; k <= 9; k++) cell[label, k] = numbers[k]
      atoms[label] = 0; reading = label; next
    }
    file == 1 && reading != "" && NF == 4 { n = ++atoms[reading]; line[reading, n] = $0; next }
    file == 2 && /^! candidate / { index_ = $3; blocks++; part = ""; next }
    file == 2 && /^CELL_PARAMETERS angstrom$/ { part = "cell"; row = 0; next }
    file == 2 && /^ATOMIC_POSITIONS angstrom$/ { part = "atoms"; atom = 0; na = cl = 0; next }
    file == 2 && part == "cell" && NF > 0 {
      if (NF != 3) bad("cell line with " NF " fields")
      for (k = 1; k <= 3; k++) {
        if (!finite($k)) bad("not a finite number: " $k)
        d = $k - cell[index_, 3 * row + k]; if (d < 0) d = -d
        if (d > tolerance) bad("cell differs from the CLI: " $0)
      }
      if (++row == 3) part = ""
      next
    }
    file == 2 && part == "atoms" && NF > 0 {
      atom++
      if (NF != 4) bad("atom line with " NF " fields")
      split(line[index_, atom], ref, " ")
      if ($1 != ref[1]) bad("atom " atom " is " $1 ", the CLI has " ref[1])
      na += $1 == "Na"; cl += $1 == "Cl"
      for (k = 2; k <= 4; k++) {
        if (!finite($k)) bad("not a finite number: " $k)
        d = $k - ref[k]; if (d < 0) d = -d
        if (d > tolerance) bad("atom " atom " differs from the CLI: " $0 " / " line[index_, atom])
      }
      if (atom == 4) { if (na != 2 || cl != 2) bad("not 2 Na and 2 Cl"); part = "" }
      next
    }
    END { if (blocks == 0) { print "no blocks"; failed = 1 } exit failed }
  ' cli_fu2/candidates.xyz nacl.cells >blocks.err
  expect $? "the blocks hold the CLI's cells and positions: $(head -n 5 blocks.err)"

  # A job file with a mistake: the driver names the file and what is wrong, before any work.
  sed 's/count = 6/count = 0/' job.nml >zero.nml
  "$dft_candidates" zero.nml >/dev/null 2>bad.err
  [[ $? -ne 0 ]] && grep -q 'zero.nml: count must be >= 1, got 0' bad.err
  expect $? "count = 0 is refused by name: $(cat bad.err)"
  sed 's/seed = 7/sead = 7/' job.nml >typo.nml
  "$dft_candidates" typo.nml >/dev/null 2>bad.err
  [[ $? -ne 0 ]] && grep -q 'typo.nml: cannot read the namelist &job' bad.err
  expect $? "an unknown key is refused with the file named: $(cat bad.err)"
fi

if [[ $failures -gt 0 ]]; then
  echo "examples test: $failures failed"
  exit 1
fi
echo "examples test: all checks passed"
