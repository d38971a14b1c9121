#!/usr/bin/env bash
# The one-node Slurm fixture end to end: it starts, runs a 4-task job array and a job that fails
# on purpose with the states Slurm documents, and stops leaving no daemon behind.
# Sources of the expectations are the Slurm 22.05 manual pages shipped with the Debian packages
# (sbatch.1, scontrol.1, squeue.1), named beside each check.
# Usage: slurm_smoke_test.sh   (as root; installs slurm-wlm and munge when missing)
set -u

source "$(dirname "$(realpath "${BASH_SOURCE[0]}")")/slurm_fixture.sh"
work=$(mktemp -d)
# Removing the folder waits for slurm_stop, which slurm_start runs first at exit.
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 1

failures=0
checks=0
# expect CONDITION_EXIT_CODE WHAT: counts a check, prints WHAT with its outcome.
expect() {
  checks=$((checks + 1))
  if [[ $1 -eq 0 ]]; then
    echo "ok: $2"
  else
    failures=$((failures + 1))
    echo "FAILED: $2"
  fi
}

# The daemons' files in a folder of their own, the jobs' output beside it.
mkdir -p cluster out
slurm_start "$work/cluster"
started=$?
# Source: this fixture's contract (slurm_start returns 0 once sinfo shows the node idle).
expect $started "slurm_start brought the node up idle"
if [[ $started -ne 0 ]]; then
  for log in cluster/log/slurmctld.log cluster/log/slurmd.log cluster/munge/munged.log; do
    [[ -f $log ]] && { echo "--- last lines of $log"; tail -n 15 "$log"; }
  done
else
  # --- A job array of 4 tasks, each writing its own index ------------------------------------
  cat >array_task.sh <<'EOF_TASK'
#!/bin/bash
echo "$SLURM_ARRAY_TASK_ID" >"out/task-$SLURM_ARRAY_TASK_ID.txt"
EOF_TASK
  sbatch --wait --quiet --array=0-3 --output=out/array-%a.log array_task.sh >array.out 2>&1
  # Source: sbatch.1, --wait: "the exit code recorded will be the highest value for any task".
  expect $? "sbatch --wait of a 4-task array exits 0: $(cat array.out)"
  for task in 0 1 2 3; do
    # Source: sbatch.1, SLURM_ARRAY_TASK_ID: "Job array ID (index) number".
    [[ $(cat "out/task-$task.txt" 2>/dev/null) == "$task" ]]
    expect $? "array task $task wrote its index $task to out/task-$task.txt"
  done

  # --- A job that fails on purpose -------------------------------------------------------------
  printf '#!/bin/bash\nexit 3\n' >failing_job.sh
  sbatch --wait --parsable --output=out/failing.log failing_job.sh >failing.out 2>failing.err
  exit_code=$?
  # Source: sbatch.1, --wait: "The exit code of the sbatch command will be the same as the exit
  # code of the submitted job".
  [[ $exit_code -eq 3 ]]
  expect $? "sbatch --wait of a job exiting 3 exits 3 (got $exit_code: $(cat failing.err))"
  job_id=$(head -n 1 failing.out | cut -d ';' -f 1)
  # The record stays in slurmctld for MinJobAge seconds (3600 in the fixture), so no
  # accounting database is needed to read it.
  scontrol show job "$job_id" >failing_job.txt 2>&1
  # Source: squeue.1, JOB STATE CODES: FAILED "Job terminated with non-zero exit code or other
  # failure condition"; scontrol.1, ExitCode=<exit>:<sig>.
  grep -q 'JobState=FAILED' failing_job.txt && grep -q 'ExitCode=3:0' failing_job.txt
  expect $? "scontrol show job $job_id reports JobState=FAILED ExitCode=3:0: \
$(grep -o 'JobState=[^ ]*\|ExitCode=[^ ]*' failing_job.txt | tr '\n' ' ')"
fi

# --- Stop: nothing left running ----------------------------------------------------------------
slurm_stop
# Source: this fixture's contract (slurm_stop returns 0 once no daemon of its names is left).
expect $? "slurm_stop reports every daemon stopped"
for daemon in slurmctld slurmd slurmstepd munged; do
  # Common practice, no source: pgrep -x matches the exact process name.
  left=$(pgrep -x "$daemon" | paste -sd ' ')
  [[ -z $left ]]
  expect $? "no $daemon process is left after slurm_stop${left:+ (pids $left)}"
done

echo "$((checks - failures)) of $checks checks passed"
# The plain closing line that test runners reading the output recognise.
echo "$((checks - failures)) passed, $failures failed"
[[ $failures -eq 0 ]]
