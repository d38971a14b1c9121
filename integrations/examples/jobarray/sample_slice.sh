#!/usr/bin/env bash
# One task of a batch job array that samples one campaign: TOTAL candidates of FORMULA from MODEL
# with SEED, split over the array's tasks. Task t of T takes the sample indices
# [t*TOTAL/T, (t+1)*TOTAL/T) (integer division: slices differ in size by at most one) and writes
# them into CAMPAIGN_DIR/slice-<t>/. Candidate i depends only on the model, the settings, SEED and
# i, so the slices together hold exactly the files of one run of TOTAL candidates; merge_slices.sh
# gathers them and names any index no task finished.
#
# Slurm (submit with: sbatch sample_slice.sh model.nucleate NaCl 100000 7 campaign):
#SBATCH --job-name=nucleate-candidates
#SBATCH --array=0-99
#SBATCH --cpus-per-task=4
#SBATCH --time=01:00:00
#SBATCH --signal=B:TERM@120
# --signal asks Slurm to send SIGTERM to this script two minutes before the time limit; the script
# passes it on, sample_candidates stops, writes what it finished and exits 3, and
# merge_slices.sh names the task to run again.
#
# Usage: sample_slice.sh MODEL FORMULA TOTAL SEED CAMPAIGN_DIR [TASK_ID TASK_COUNT]
#   Without TASK_ID and TASK_COUNT the task is Slurm's: SLURM_ARRAY_TASK_ID, counted from
#   SLURM_ARRAY_TASK_MIN, of SLURM_ARRAY_TASK_COUNT tasks. Other schedulers pass their own, e.g.
#   PBS Pro: sample_slice.sh ... "$PBS_ARRAY_INDEX" 100 (with #PBS -J 0-99).
# Environment:
#   SAMPLE_CANDIDATES  the C example program (integrations/examples/c); default: sample_candidates
#                      on PATH
#   SLURM_CPUS_PER_TASK  threads for the task when set; otherwise every core
set -euo pipefail

fail() {
  echo "sample_slice.sh: $*" >&2
  exit 2
}

[[ $# -eq 5 || $# -eq 7 ]] ||
  fail "usage: sample_slice.sh MODEL FORMULA TOTAL SEED CAMPAIGN_DIR [TASK_ID TASK_COUNT]"
model=$1 formula=$2 total=$3 seed=$4 campaign=$5
if [[ $# -eq 7 ]]; then
  task=$6 tasks=$7
else
  [[ -n ${SLURM_ARRAY_TASK_ID:-} && -n ${SLURM_ARRAY_TASK_COUNT:-} ]] ||
    fail "no TASK_ID and TASK_COUNT given, and SLURM_ARRAY_TASK_ID / SLURM_ARRAY_TASK_COUNT unset"
  [[ ${SLURM_ARRAY_TASK_ID} =~ ^[0-9]+$ && ${SLURM_ARRAY_TASK_MIN:-0} =~ ^[0-9]+$ ]] ||
    fail "SLURM_ARRAY_TASK_ID '${SLURM_ARRAY_TASK_ID}' is not a whole number"
  # An array --array=1-100 counts from 1: slices count from the lowest task id.
  task=$((SLURM_ARRAY_TASK_ID - ${SLURM_ARRAY_TASK_MIN:-0}))
  tasks=$SLURM_ARRAY_TASK_COUNT
fi

for name in total seed task tasks; do
  [[ ${!name} =~ ^[0-9]+$ ]] || fail "$name must be a whole number >= 0, got '${!name}'"
done
((tasks >= 1)) || fail "the array needs at least one task, got $tasks"
((task < tasks)) || fail "task $task is outside an array of $tasks tasks (0 .. $((tasks - 1)))"
((total >= 1 && total <= 4294967296)) ||
  fail "TOTAL must be from 1 to 4294967296 (sample indices are 32-bit), got $total"
((seed <= 4294967295)) || fail "SEED must be from 0 to 4294967295, got $seed"

first=$((task * total / tasks))
end=$(((task + 1) * total / tasks))
count=$((end - first))
slice="$campaign/slice-$task"
mkdir -p "$slice"
# What the merge checks: every slice of a campaign names the same campaign, and its own range.
cat >"$slice/slice.txt" <<EOF
campaign model=$model formula=$formula total=$total seed=$seed tasks=$tasks
range first=$first count=$count
EOF
if ((count == 0)); then
  echo "sample_slice.sh: task $task of $tasks has no candidates ($total for $tasks tasks)" >&2
  echo "done" >>"$slice/slice.txt"
  exit 0
fi

echo "sample_slice.sh: task $task of $tasks: candidates $first .. $((end - 1)) of $total" >&2
# In the background, so that a signal to this script can be passed on (bash runs a trap only
# after a foreground command ends). SIGTERM for both: a non-interactive shell starts background
# programs with SIGINT ignored.
# The trap is set first, so that a signal arriving while the program starts is not lost.
child=""
stop=""
trap 'stop=1; [[ -z $child ]] || kill -TERM "$child" 2>/dev/null || true' TERM INT
"${SAMPLE_CANDIDATES:-sample_candidates}" "$model" "$formula" "$seed" "$first" "$count" "$slice" \
  ${SLURM_CPUS_PER_TASK:+"$SLURM_CPUS_PER_TASK"} >"$slice/candidates.tsv" &
child=$!
[[ -z $stop ]] || kill -TERM "$child" 2>/dev/null || true
# wait returns early when a trapped signal arrives: wait again until the program has ended.
while :; do
  wait "$child" && status=0 || status=$?
  kill -0 "$child" 2>/dev/null || break
done
# Only a slice that ran to the end is marked done; the merge names the others.
((status == 0)) && echo "done" >>"$slice/slice.txt"
exit "$status"
