#!/usr/bin/env bash
# `nucleate sample` end to end, as a user runs it: train two tiny models with `nucleate train`,
# then sample each task, through a job file and flags, and check the files, the table, the
# errors, reproducibility and Ctrl-C. Plain bash and the CLI itself (no jq, no Python): the
# CLI's own `check` and `convert` read the files back.
# Usage: sample_command_test.sh NUCLEATE_EXECUTABLE
set -u

source "$(dirname "${BASH_SOURCE[0]}")/cli_test_support.sh" "$@"

# --- Two tiny models -------------------------------------------------------------------------
# Primitive rock-salt NaCl (a = 5.64 A, primitive 3.98808 A at 60 degrees), CsCl-type CsCl
# (a = 4.12 A) and TlCl (a = 3.84 A): lattice constants from memory. Sizes as
# tests/abi/fortran_model_test.f90 (hidden 16, one layer, 20 diffusion steps, 2 epochs).
mkdir -p given/structures absorbing/structures
write_cif given/structures/NaCl.cif NaCl 3.98808 60 "Na 0 0 0" "Cl 0.5 0.5 0.5"
write_cif given/structures/CsCl.cif CsCl 4.12 90 "Cs 0 0 0" "Cl 0.5 0.5 0.5"
write_cif absorbing/structures/NaCl.cif NaCl 3.98808 60 "Na 0 0 0" "Cl 0.5 0.5 0.5"
write_cif absorbing/structures/TlCl.cif TlCl 3.84 90 "Tl 0 0 0" "Cl 0.5 0.5 0.5"
for kind in given absorbing; do
  cat >"$kind/train.yaml" <<EOF
data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 16, layers: 1, time_embedding: 8, species: $kind}
diffusion: {steps: 20}
training: {epochs: 2, batch_size: 2, micro_batch: 1, warmup_steps: 1}
output: {model: model.nucleate}
EOF
  "$cli" train --config "$kind/train.yaml" >/dev/null 2>"$kind/train.err"
  expect $? "train the $kind model: $(tail -n 1 "$kind/train.err")"
done
if [[ $failures -gt 0 ]]; then
  echo "no models, no sampling: $failures failed"
  exit 1
fi
model=given/model.nucleate

# --- Composition task ------------------------------------------------------------------------
# Source for the file layout and the summary's keys: the brief of `nucleate sample` as written in
# integrations/cli/SAMPLE_JOB.md and the design note DESIGN.md ("nucleate sample ... --out DIR:
# writes one CIF per candidate and a summary").
"$cli" sample --model $model --out comp --composition NaCl --count 3 --seed 11 \
  >comp.out 2>comp.err
expect $? "composition run exits 0: $(tail -n 1 comp.err)"
for i in 0 1 2; do
  [[ -s comp/sample-$i.cif ]]
  expect $? "comp/sample-$i.cif written"
done
[[ ! -e comp/sample-3.cif ]]
expect $? "no fourth CIF for --count 3"
[[ -s comp/candidates.xyz ]]
expect $? "comp/candidates.xyz written"
# The HTML report: self-contained (no scripts, no external links), the caution, one drawing per
# candidate.
[[ $(grep -o '<svg' comp/report.html | wc -l) -eq 3 ]]
expect $? "report.html draws the 3 cells"
grep -q 'hypotheses' comp/report.html && ! grep -qi '<script\|src=\|href=' comp/report.html
expect $? "report.html carries the caution and nothing external"
[[ $(lines comp/summary.jsonl) -eq 3 ]]
expect $? "summary.jsonl has 3 lines, has $(lines comp/summary.jsonl)"
for key in index formula num_atoms valid problems space_group_number min_distance density group \
  representative toxic_elements radioactive_elements file; do
  [[ $(grep -c "\"$key\":" comp/summary.jsonl) -eq 3 ]]
  expect $? "every summary line has \"$key\""
done
grep -q '"file":"sample-0.cif"' comp/summary.jsonl
expect $? "the summary names each candidate's file"
# Readable back by the CLI's own checker: three reports, none an unreadable file.
"$cli" check --json comp/sample-*.cif >comp.check 2>/dev/null
[[ $(grep -c '"formula":"ClNa"' comp.check) -eq 3 && $(grep -c '"error"' comp.check) -eq 0 ]]
expect $? "nucleate check --json reads the 3 CIFs as ClNa: $(cat comp.check)"
"$cli" check --json comp/candidates.xyz >comp.xyz.check 2>/dev/null
[[ $(grep -c '"formula":"ClNa"' comp.xyz.check) -eq 3 ]]
expect $? "candidates.xyz holds the 3 candidates as frames"
# The caution comes before the table and the counts (the reply's caution line).
[[ $(head -n 1 comp.out) == *hypotheses* ]]
expect $? "stdout starts with the caution: $(head -n 1 comp.out)"
grep -q '^ *index  formula' comp.out
expect $? "stdout has the table header"
[[ $(grep -cE '^ +[0-9]+  ClNa ' comp.out) -eq 3 ]]
expect $? "the table has a row per candidate"
grep -q '^3 requested: 3 finished' comp.out
expect $? "the counts follow the table"
head -n 1 comp/sample-0.cif | grep -q hypotheses
expect $? "each CIF opens with the caution as a comment"

# Existing candidate files are kept unless --force.
"$cli" sample --model $model --out comp --composition NaCl --count 3 --seed 11 \
  >/dev/null 2>force.err
code=$?
[[ $code -eq 2 ]] && grep -q -- '--out' force.err && grep -q 'sample-0.cif' force.err
expect $? "a rerun into comp/ is refused naming --out and the file ($code): $(cat force.err)"
"$cli" sample --model $model --out comp --composition NaCl --count 3 --seed 11 --force \
  >/dev/null 2>&1
expect $? "--force overwrites"

# --- Reproducibility -------------------------------------------------------------------------
# Source: schemas/nucleate/v1/sample.proto, SampleRequest.seed: "the same bytes whatever the
# count, thread count or split across processes".
"$cli" sample --model $model --out again --composition NaCl --count 3 --seed 11 >/dev/null 2>&1
cmp -s comp/summary.jsonl again/summary.jsonl
expect $? "the same seed twice gives a byte-identical summary.jsonl"
"$cli" sample --model $model --out threads1 --composition NaCl --count 9 --seed 4 --threads 1 \
  >/dev/null 2>&1
"$cli" sample --model $model --out threads2 --composition NaCl --count 9 --seed 4 --threads 2 \
  >/dev/null 2>&1
diff -r threads1 threads2 >threads.diff
expect $? "--threads 1 and 2 give identical candidate files: $(head -n 3 threads.diff)"
"$cli" sample --model $model --out split --composition NaCl --count 4 --seed 4 --first-index 5 \
  --threads 1 >/dev/null 2>&1
cmp -s split/sample-7.cif threads1/sample-7.cif
expect $? "--first-index 5 gives candidate 7 the bytes of a full run's candidate 7"

# --- Job file and flag overrides -------------------------------------------------------------
# Source: integrations/cli/SAMPLE_JOB.md (relative paths against the job file's folder; flags
# override the file).
mkdir -p jobs
cat >jobs/job.yaml <<'EOF'
model: ../given/model.nucleate
out: ../from_job
composition: NaCl
formula_units: 1-2
count: 2
seed: 3
sampler: ddim
eta: 0.5
multi_cif: false
EOF
"$cli" sample --job jobs/job.yaml --log job.log >/dev/null 2>job.err
expect $? "the job file runs: $(tail -n 1 job.err)"
[[ -s from_job/sample-0.cif && -s from_job/sample-1.cif && ! -e from_job/sample-2.cif ]]
expect $? "the job file's out (relative to the file) holds its count of 2 CIFs"
grep -q '^progress 100%' job.log && grep -q '^2 requested' job.log
expect $? "--log holds plain progress lines and the counts: $(cat job.log)"
"$cli" sample --job jobs/job.yaml --count 4 --out overridden >/dev/null 2>&1
expect $? "the job file with flags runs"
[[ $(lines overridden/summary.jsonl) -eq 4 ]]
expect $? "--count 4 overrides the file's count 2"
"$cli" sample --model $model --out by_flags --composition NaCl --formula-units 1-2 --count 4 \
  --seed 3 --sampler ddim --eta 0.5 >/dev/null 2>&1
cmp -s overridden/summary.jsonl by_flags/summary.jsonl
expect $? "job file + overrides equal the same settings given as flags"
printf 'model: m\nout: o\ncomposition: NaCl\nsead: 3\n' >jobs/typo.yaml
"$cli" sample --job jobs/typo.yaml >/dev/null 2>typo.err
code=$?
[[ $code -eq 2 ]] && grep -q 'typo.yaml:4: sead: unknown key' typo.err
expect $? "an unknown key is refused with its line (exit $code): $(cat typo.err)"

# --- Constrained task ------------------------------------------------------------------------
# Source: sample.proto, ConstrainedTask: fixed atoms keep their positions exactly; added atoms
# follow the structure's atoms. The coordinates are invented, with at most 8 decimals so the CIF
# writer's 8 decimals hold them exactly.
write_cif host.cif Host 3.98808 60 "Na 0.125 0.25 0.375" "Cl 0.625 0.75 0.875"
input_frac=$("$cli" convert --to json host.cif | json_array frac_coords)
"$cli" sample --model $model --out constrained --constrain host.cif --fix-atoms all --add Na \
  --count 3 --seed 2 >/dev/null 2>constrained.err
expect $? "constrained run exits 0: $(tail -n 1 constrained.err)"
for i in 0 1 2; do
  json=$("$cli" convert --to json constrained/sample-$i.cif)
  frac=$(json_array frac_coords <<<"$json")
  [[ $frac == "${input_frac%]},"* ]]
  expect $? "candidate $i keeps the fixed atoms at $input_frac exactly: $frac"
  [[ $(json_array atomic_numbers <<<"$json") == "[11,17,11]" ]]
  expect $? "candidate $i is the host plus one Na: $(json_array atomic_numbers <<<"$json")"
done

# --- Variation task --------------------------------------------------------------------------
"$cli" sample --model $model --out varied --vary given/structures/NaCl.cif --strength 0.5 \
  --count 2 >/dev/null 2>varied.err
expect $? "variation run exits 0: $(tail -n 1 varied.err)"
"$cli" check --json varied/sample-*.cif >varied.check 2>/dev/null
[[ $(grep -c '"formula":"ClNa"' varied.check) -eq 2 ]]
expect $? "variations keep the structure's composition: $(cat varied.check)"

# --- De novo, and the toxic flag (model trained with species: absorbing) -------------------
"$cli" sample --model absorbing/model.nucleate --out denovo --de-novo --elements Na,Cl \
  --count 3 >denovo.out 2>denovo.err
expect $? "de novo run exits 0: $(tail -n 1 denovo.err)"
[[ $(lines denovo/summary.jsonl) -eq 3 ]]
expect $? "de novo: 3 summary lines"
species=$("$cli" convert --to json denovo/candidates.xyz | grep -o '"atomic_numbers":\[[^]]*\]' \
  | grep -o '[0-9]\+' | sort -u | tr '\n' ' ')
only_na_cl=0
for z in $species; do
  [[ $z == 11 || $z == 17 ]] || only_na_cl=1
done
[[ -n $species && $only_na_cl -eq 0 ]]
expect $? "de novo with --elements Na,Cl uses only Na (11) and Cl (17): $species"
# Tl is flagged toxic by the library (core/elements/elements.cc); the fixed TlCl host is in
# every candidate.
write_cif tlcl.cif TlCl 3.84 90 "Tl 0 0 0" "Cl 0.5 0.5 0.5"
"$cli" sample --model absorbing/model.nucleate --out flagged --constrain tlcl.cif \
  --fix-atoms all --add '?' --count 1 >flagged.out 2>flagged.err
expect $? "constrained run with a generated species exits 0: $(tail -n 1 flagged.err)"
grep -q 'toxic:Tl' flagged.out
expect $? "the table flags Tl as toxic: $(cat flagged.out)"
grep -q '"toxic_elements":\["Tl"\]' flagged/summary.jsonl
expect $? "summary.jsonl flags Tl as toxic"

# --- One multi-block CIF ---------------------------------------------------------------------
"$cli" sample --model $model --out multi --composition NaCl --count 3 --multi-cif >/dev/null 2>&1
expect $? "--multi-cif exits 0"
[[ $(grep -c '^data_' multi/candidates.cif) -eq 3 && ! -e multi/sample-0.cif ]]
expect $? "--multi-cif writes one candidates.cif with 3 data blocks"

# --- Bad input -------------------------------------------------------------------------------
# Source: README.md, "exit ... 2 on a command-line mistake", 1 when the library refused.
"$cli" sample --model $model --out bad --composition NaCl --count x >bad.out 2>bad.err
code=$?
[[ $code -eq 2 && $(wc -l <bad.err) -eq 1 ]] && grep -q -- '--count' bad.err
expect $? "--count x: exit 2 with one line naming --count (exit $code): $(cat bad.err)"
[[ ! -e bad ]]
expect $? "a refused command leaves no out folder"
"$cli" sample --model $model --out bad --composition NaCl --eta 5 >/dev/null 2>bad.err
code=$?
[[ $code -eq 1 && $(wc -l <bad.err) -eq 1 ]] && grep -q 'sampler.eta' bad.err \
  && grep -q -- '--eta' bad.err
expect $? "--eta 5: exit 1 naming the field and the flag (exit $code): $(cat bad.err)"
"$cli" sample --model $model --out bad --composition NaCl --de-novo >/dev/null 2>bad.err
code=$?
[[ $code -eq 2 ]] && grep -q -- '--de-novo' bad.err
expect $? "two tasks are refused naming one (exit $code): $(cat bad.err)"

# --- Ctrl-C ----------------------------------------------------------------------------------
# A run far longer than the test (20000 samples on one thread) is interrupted once the log shows
# progress; the finished candidates are written and the exit code says it was cancelled.
"$cli" sample --model $model --out cancelled --composition NaCl --count 20000 --threads 1 \
  --log cancel.log >/dev/null 2>cancel.err &
interrupt_when_progressing $! cancel.log
code=$?
kept=$(sed -n 's/.*kept \([0-9]*\) of 20000.*/\1/p' cancel.err)
[[ $code -eq 1 && -n $kept ]]
expect $? "Ctrl-C: exit 1 and a message saying how many were kept (exit $code): $(cat cancel.err)"
kept=${kept:-0}
cifs=$(find cancelled -name 'sample-*.cif' | wc -l)
summary_lines=$(lines cancelled/summary.jsonl)
[[ $kept -lt 20000 && $summary_lines -eq $kept && $cifs -eq $kept ]]
expect $? "Ctrl-C: the $kept kept candidates are written ($cifs CIFs, $summary_lines summary lines)"

echo "sample command test: $((checks - failures)) of $checks checks passed"
[[ $failures -eq 0 ]]
