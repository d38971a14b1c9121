#!/usr/bin/env bash
# The batch examples under a real one-node Slurm (slurm_fixture.sh), as a cluster user runs them:
#  - integrations/examples/jobarray/sample_slice.sh submitted with sbatch as an array of 4 tasks:
#    the merged slices equal one serial run of the C example, byte for byte;
#  - nucleate-mpi sample as a Slurm step with 2 tasks (srun --mpi=pmix inside sbatch): the files
#    of the serial `nucleate sample`, byte for byte;
#  - an array whose task 2 asks for an impossible composition on purpose: the job's state shows
#    the failure, the task's log carries nucleate's message, and tasks 0, 1 and 3 hold their
#    candidates, equal to the serial run's.
# Sources of the expectations: schemas/nucleate/v1/sample.proto (SampleRequest.first_index: the
# same bytes whatever the split across processes) and the Slurm 22.05 manual pages of the Debian
# packages (sbatch.1: --wait returns the highest exit code of the array's tasks; scontrol.1).
# Usage: slurm_examples_test.sh NUCLEATE_CLI SAMPLE_CANDIDATES JOBARRAY_DIR NUCLEATE_MPI
set -u

if [[ $# -ne 4 ]]; then
  echo "usage: $0 NUCLEATE_CLI SAMPLE_CANDIDATES JOBARRAY_DIR NUCLEATE_MPI" >&2
  exit 2
fi
cli=$(realpath "$1")
export SAMPLE_CANDIDATES
SAMPLE_CANDIDATES=$(realpath "$2")
slice_script=$(realpath "$3/sample_slice.sh")
merge_script=$(realpath "$3/merge_slices.sh")
mpi_driver=$(realpath "$4")
here=$(dirname "$(realpath "${BASH_SOURCE[0]}")")
source "$here/../integrations/tiny_model.sh"
source "$here/slurm_fixture.sh"
work=$(mktemp -d)
# Runs after slurm_stop (slurm_start keeps this trap and runs it after the stop).
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 1
unset SLURM_ARRAY_TASK_ID SLURM_ARRAY_TASK_COUNT SLURM_ARRAY_TASK_MIN SLURM_CPUS_PER_TASK

train_tiny_model "$cli" tiny
model=$work/tiny/model.nucleate
"$SAMPLE_CANDIDATES" "$model" NaCl 11 0 8 serial >serial.tsv 2>serial.err
expect $? "the serial run of the C example: $(tail -n 2 serial.err)"
"$cli" sample --model "$model" --composition NaCl --count 8 --seed 11 --threads 1 \
  --out serial-cli >/dev/null 2>serial-cli.err
expect $? "the serial run of nucleate sample: $(tail -n 2 serial-cli.err)"

mkdir -p cluster logs
fixture_started=$EPOCHREALTIME
if ! slurm_start "$work/cluster"; then
  echo "FAILED: Slurm did not start; the rest is skipped"
  exit 1
fi

# --- The job array: 4 tasks of one campaign -----------------------------------------------------
# The flags override the script's #SBATCH lines: 4 tasks, and 1 CPU each on this small node.
sbatch --wait --array=0-3 --cpus-per-task=1 --output="logs/four-%a.out" \
  "$slice_script" "$model" NaCl 8 11 four >sbatch-four.out 2>&1
expect $? "sbatch --array=0-3 sample_slice.sh: every task exits 0: $(cat sbatch-four.out)"
bash "$merge_script" four >merge.out 2>&1
expect $? "merge_slices.sh gathers the 4 slices: $(cat merge.out)"
diff <(listing serial) <(listing four/candidates) >merged.diff
expect $? "the array's candidates are the serial run's files, byte for byte: $(head -n 4 merged.diff)"
cmp -s serial.tsv four/candidates/candidates.tsv
expect $? "the merged candidates.tsv is the serial run's listing"

# --- The MPI example as a Slurm step with 2 tasks -----------------------------------------------
sbatch --wait --ntasks=2 --cpus-per-task=1 --output=logs/mpi.out \
  --wrap="srun --mpi=pmix '$mpi_driver' sample --model '$model' --composition NaCl --count 8 --seed 11 --threads 1 --out mpi" \
  >sbatch-mpi.out 2>&1
expect $? "sbatch with srun -n 2 nucleate-mpi sample exits 0: $(cat sbatch-mpi.out; tail -n 3 logs/mpi.out)"
grep -q '^8 requested: 8 finished' logs/mpi.out
expect $? "the step's log shows rank 0's table of 8 candidates: $(tail -n 3 logs/mpi.out)"
diff -r serial-cli mpi >mpi.diff
expect $? "the 2-task step wrote the serial run's files, byte for byte: $(head -n 4 mpi.diff)"

# --- A task that fails on purpose -------------------------------------------------------------
# Task 2 asks for FeO, which the tiny model (Na, K, Cl) cannot make; the others for NaCl.
cat >failing_task.sh <<EOF_TASK
#!/usr/bin/env bash
formula=NaCl
[[ \$SLURM_ARRAY_TASK_ID == 2 ]] && formula=FeO
exec bash '$slice_script' '$model' "\$formula" 8 11 failing
EOF_TASK
sbatch --wait --array=0-3 --cpus-per-task=1 --output="logs/failing-%a.out" --parsable \
  failing_task.sh >sbatch-failing.out 2>&1
code=$?
job=$(head -n 1 sbatch-failing.out | cut -d';' -f1)
[[ $code -ne 0 ]]
expect $? "sbatch --wait reports the failed task with a non-zero exit ($code)"
state=$(scontrol show job "${job}_2" 2>&1)
grep -q 'JobState=FAILED' <<<"$state" && grep -q 'ExitCode=[1-9][0-9]*:0' <<<"$state"
expect $? "scontrol shows task 2 FAILED with its exit code: $(grep -o 'JobState=[A-Z]* .*\|ExitCode=[0-9:]*' <<<"$state" | head -n 2 | paste -sd ' ')"
grep -q "Fe (element 26) is not in the model's vocabulary" logs/failing-2.out
expect $? "task 2's log carries nucleate's message: $(tail -n 2 logs/failing-2.out)"
for task in 0 1 3; do
  grep -qx done "failing/slice-$task/slice.txt" &&
    diff <(listing serial | sed -n "$((task * 2 + 1)),$((task * 2 + 2))p") \
      <(listing "failing/slice-$task") >/dev/null
  expect $? "task $task finished and holds the serial run's candidates $((task * 2)) and $((task * 2 + 1))"
done
scontrol show job "${job}_0" | grep -q 'JobState=COMPLETED'
expect $? "task 0 of that array COMPLETED"

slurm_stop
expect $? "slurm_stop leaves no daemon running"
echo "slurm fixture and jobs: $(awk -v s="$fixture_started" -v n="$EPOCHREALTIME" 'BEGIN { printf "%.1f", n - s }') s"
for daemon in slurmctld slurmd slurmstepd munged; do
  ! pgrep -x $daemon >/dev/null
  expect $? "no $daemon process is left"
done

if [[ $failures -gt 0 ]]; then
  echo "Slurm examples test: $failures failed"
  exit 1
fi
echo "Slurm examples test: all passed"
