#!/usr/bin/env bash
# The job-array example end to end: one serial run of 8 candidates with the C example, then the
# same campaign as a job array of 4 tasks (run one after another here, with the variables Slurm
# sets) and of 3 tasks (task numbers as arguments), gathered by merge_slices.sh. Source of the
# expectation: schemas/nucleate/v1/sample.proto, SampleRequest.first_index: "the same bytes
# whatever the count, thread count or split across processes".
# Usage: jobarray_test.sh NUCLEATE_CLI SAMPLE_CANDIDATES JOBARRAY_DIR
set -u

if [[ $# -ne 3 ]]; then
  echo "usage: $0 NUCLEATE_CLI SAMPLE_CANDIDATES JOBARRAY_DIR" >&2
  exit 2
fi
cli=$(realpath "$1")
export SAMPLE_CANDIDATES
SAMPLE_CANDIDATES=$(realpath "$2")
slice_script="$3/sample_slice.sh"
merge_script="$3/merge_slices.sh"
source "$(dirname "${BASH_SOURCE[0]}")/tiny_model.sh"
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 1
unset SLURM_ARRAY_TASK_ID SLURM_ARRAY_TASK_COUNT SLURM_ARRAY_TASK_MIN SLURM_CPUS_PER_TASK

train_tiny_model "$cli" tiny
model=tiny/model.nucleate

"$SAMPLE_CANDIDATES" $model NaCl 11 0 8 serial >serial.tsv 2>serial.err
expect $? "the serial run: $(tail -n 2 serial.err)"
[[ $(listing serial | wc -l) -eq 8 ]]
expect $? "the serial run wrote 8 candidate files: $(ls serial)"

# --- 4 tasks, as Slurm runs them: SLURM_ARRAY_TASK_ID 0..3 of SLURM_ARRAY_TASK_COUNT 4 ----------
for task in 0 1 2; do
  SLURM_ARRAY_TASK_ID=$task SLURM_ARRAY_TASK_COUNT=4 bash "$slice_script" $model NaCl 8 11 four \
    2>>four.err
  expect $? "array task $task of 4: $(tail -n 2 four.err)"
done
# Before the last task has run, the merge refuses and names it.
bash "$merge_script" four >merge_early.out 2>&1
[[ $? -ne 0 ]] && grep -q 'run these tasks again: 3$' merge_early.out && [[ ! -d four/candidates ]]
expect $? "a merge before task 3 ran names task 3 and gathers nothing: $(cat merge_early.out)"
SLURM_ARRAY_TASK_ID=3 SLURM_ARRAY_TASK_COUNT=4 bash "$slice_script" $model NaCl 8 11 four \
  2>>four.err
expect $? "array task 3 of 4: $(tail -n 2 four.err)"
for task in 0 1 2 3; do
  grep -qx "range first=$((task * 2)) count=2" "four/slice-$task/slice.txt"
  expect $? "task $task of 4 takes indices $((task * 2)) and $((task * 2 + 1))"
  [[ $(listing "four/slice-$task" | wc -l) -eq 2 ]]
  expect $? "task $task wrote its 2 candidates only: $(ls "four/slice-$task")"
done
# The union of the slices' files is the serial run's, byte for byte.
diff <(listing serial) <(listing four/slice-*) >union.diff
expect $? "the 4 slices' files are the serial run's: $(head -n 4 union.diff)"
bash "$merge_script" four >merge.out 2>&1
expect $? "merge of 4 slices: $(cat merge.out)"
diff <(listing serial) <(listing four/candidates) >merged.diff
expect $? "the merged folder holds the serial run's files: $(head -n 4 merged.diff)"
cmp -s serial.tsv four/candidates/candidates.tsv
expect $? "the merged candidates.tsv is the serial run's listing"
head -n 1 four/candidates/candidates.tsv | grep -q '^# .*hypotheses'
expect $? "the merged listing opens with the caution"

# --- 3 tasks, numbers as arguments: uneven slices 0-1, 2-4, 5-7 ---------------------------------
for task in 0 1 2; do
  bash "$slice_script" $model NaCl 8 11 three $task 3 2>>three.err
  expect $? "task $task of 3 by arguments: $(tail -n 2 three.err)"
done
grep -qx 'range first=2 count=3' three/slice-1/slice.txt
expect $? "task 1 of 3 takes indices 2..4 ($((1 * 8 / 3)) to $((2 * 8 / 3 - 1)))"
bash "$merge_script" three >merge3.out 2>&1 && diff <(listing serial) <(listing three/candidates)
expect $? "3 uneven slices merge to the serial run's files: $(cat merge3.out)"

# --- Refusals ----------------------------------------------------------------------------------
# A slice of another campaign (another seed) in the folder stops the merge, naming it.
cp -r four mixed
rm -rf mixed/candidates
bash "$slice_script" $model NaCl 8 12 other 1 4 2>/dev/null
rm -rf mixed/slice-1
cp -r other/slice-1 mixed/
bash "$merge_script" mixed >mixed.out 2>&1
[[ $? -ne 0 ]] && grep -q 'slice-1/slice.txt is of another campaign' mixed.out
expect $? "slices of two campaigns are refused: $(cat mixed.out)"
bash "$slice_script" $model NaCl 8 11 bad 4 4 >bad.out 2>&1
[[ $? -eq 2 ]] && grep -q 'task 4 is outside an array of 4 tasks' bad.out
expect $? "a task outside the array is refused: $(cat bad.out)"
bash "$slice_script" $model NaCl 8 11 bad >bad.out 2>&1
[[ $? -eq 2 ]] && grep -q 'SLURM_ARRAY_TASK_ID' bad.out
expect $? "no task number and no Slurm variables is refused: $(cat bad.out)"

# --- A scheduler's SIGTERM before the time limit ----------------------------------------------
# The script passes it on; the C example stops, writes what it finished and exits 3; the slice is
# not marked done, so the merge names the task. 20000 candidates take far longer than the wait.
bash "$slice_script" $model NaCl 20000 11 stopped 0 1 2>stopped.err &
slice_pid=$!
# Waits for 10 % done, so that some candidates have finished when the signal comes.
for _ in $(seq 1 300); do
  grep -q '^progress: sample [1-9][0-9]%' stopped.err && break
  sleep 0.1
done
kill -TERM $slice_pid
wait $slice_pid
code=$?
[[ $code -eq 3 ]] && ! grep -qx done stopped/slice-0/slice.txt
expect $? "SIGTERM: exit 3 ($code), slice not marked done: $(tail -n 2 stopped.err)"
grep -q 'cancelled; the finished candidates were written' stopped.err
expect $? "the C example reports the cancellation"
written=$(listing stopped/slice-0 | wc -l)
listed=$(grep -vc '^#' stopped/slice-0/candidates.tsv)
[[ $written -gt 0 && $written -lt 20000 && $written -eq $listed ]]
expect $? "the finished candidates, and only they, were written and listed ($written files)"
bash "$merge_script" stopped >stopped.out 2>&1
[[ $? -ne 0 ]] && grep -q 'run these tasks again: 0$' stopped.out
expect $? "the merge names the stopped task: $(cat stopped.out)"

if [[ $failures -gt 0 ]]; then
  echo "jobarray test: $failures failed"
  exit 1
fi
echo "jobarray test: all checks passed"
