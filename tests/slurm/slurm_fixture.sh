# A real one-node Slurm cluster on loopback for tests: munged, slurmctld and slurmd started from
# a configuration written under a test's own folder, and stopped again by the same test.
# Source this file, then:
#   slurm_start WORKDIR   installs slurm-wlm and munge when missing, starts the three daemons,
#                         exports SLURM_CONF and waits until the node is idle; returns non-zero
#                         with a message when something did not come up.
#   slurm_stop            stops what slurm_start started and checks that no daemon is left.
# slurm_start also arranges slurm_stop to run at exit, so a failing test stops the cluster too.
# Needs root (the daemons run as root, as SlurmUser=root) and bash 5 ($EPOCHREALTIME).

slurm_fixture_dir=""        # WORKDIR of the running cluster; empty when none is running
slurm_fixture_node=localhost
# Every daemon a cluster of ours can leave behind; slurmstepd runs the steps of jobs.
slurm_fixture_daemons=(slurmd slurmstepd slurmctld munged)

# Seconds since an $EPOCHREALTIME taken earlier, to one decimal.
slurm_fixture_seconds_since() {
  awk -v start="$1" -v now="$EPOCHREALTIME" 'BEGIN { printf "%.1f", now - start }'
}

# Installs the packages only when dpkg does not already have them. invoke-rc.d would start the
# packaged services on a machine without a policy forbidding it; a temporary policy-rc.d that
# answers 101 ("action forbidden") keeps them down, since this fixture starts its own daemons.
slurm_fixture_install() {
  local missing=() package
  for package in slurm-wlm slurmctld slurmd slurm-client munge; do
    dpkg-query -W -f='${Status}' "$package" 2>/dev/null | grep -q 'install ok installed' ||
      missing+=("$package")
  done
  [[ ${#missing[@]} -eq 0 ]] && return 0
  echo "slurm fixture: installing ${missing[*]}"
  local policy=/usr/sbin/policy-rc.d made_policy=0
  if [[ ! -e $policy ]]; then
    printf '#!/bin/sh\nexit 101\n' >"$policy" && chmod 755 "$policy" && made_policy=1
  fi
  local status=0
  # A machine whose package lists were never fetched knows no candidate: update once, retry.
  DEBIAN_FRONTEND=noninteractive apt-get install -y -q --no-install-recommends "${missing[@]}" \
    >/dev/null ||
    { apt-get update -q >/dev/null &&
      DEBIAN_FRONTEND=noninteractive apt-get install -y -q --no-install-recommends \
        "${missing[@]}" >/dev/null; } || status=$?
  [[ $made_policy -eq 1 ]] && rm -f "$policy"
  [[ $status -eq 0 ]] || echo "slurm fixture: apt-get install ${missing[*]} failed" >&2
  return $status
}

# The first port from $1 upward that nothing on loopback listens on (bash's /dev/tcp connects
# only when a listener is there), so a system Slurm on 6817/6818 or another test does not clash.
slurm_fixture_free_port() {
  local port=$1
  while (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; do port=$((port + 1)); done
  echo "$port"
}

# slurm.conf for one node on 127.0.0.1. No cgroups (a container may have none to delegate):
# proctrack/linuxproc and task/none. No accounting daemon: job records are kept by slurmctld for
# MinJobAge seconds, long enough for a test to read a finished job with scontrol.
slurm_fixture_write_conf() {
  local dir=$1 ctld_port slurmd_port
  ctld_port=$(slurm_fixture_free_port 16817)
  slurmd_port=$(slurm_fixture_free_port $((ctld_port + 1)))
  cat >"$dir/slurm.conf" <<EOF
ClusterName=nucleatetest
SlurmctldHost=$slurm_fixture_node(127.0.0.1)
SlurmctldPort=$ctld_port
SlurmdPort=$slurmd_port
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$dir/munge/munge.socket
MpiDefault=none
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
ReturnToService=2
MinJobAge=3600
MailProg=/bin/true
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/run/slurmctld.pid
SlurmdPidFile=$dir/run/slurmd.pid
SlurmctldLogFile=$dir/log/slurmctld.log
SlurmdLogFile=$dir/log/slurmd.log
NodeName=$slurm_fixture_node NodeAddr=127.0.0.1 NodeHostname=$slurm_fixture_node CPUs=$(nproc) RealMemory=1000 State=UNKNOWN
PartitionName=test Nodes=$slurm_fixture_node Default=YES MaxTime=INFINITE State=UP
EOF
}

# munged with its own key, socket, pid and log under the test's folder, so the machine's own
# munge (if any) is neither used nor disturbed. --force: munged refuses to run as root otherwise.
slurm_fixture_start_munged() {
  local dir=$1/munge
  mkdir -p "$dir" && chmod 700 "$dir"
  dd if=/dev/urandom of="$dir/munge.key" bs=1024 count=1 status=none && chmod 400 "$dir/munge.key"
  munged --force --socket="$dir/munge.socket" --key-file="$dir/munge.key" \
    --pid-file="$dir/munged.pid" --log-file="$dir/munged.log" --seed-file="$dir/munged.seed" ||
    { echo "slurm fixture: munged did not start; its log: $dir/munged.log" >&2; return 1; }
}

# slurm_start WORKDIR: see the top of this file.
slurm_start() {
  if [[ $# -ne 1 || ! -d $1 ]]; then
    echo "slurm fixture: usage: slurm_start EXISTING_WORKDIR" >&2
    return 2
  fi
  if [[ -n $slurm_fixture_dir ]]; then
    echo "slurm fixture: already running in $slurm_fixture_dir" >&2
    return 1
  fi
  if [[ $(id -u) -ne 0 ]]; then
    # ctest reads exit code 77 as "skipped" (SKIP_RETURN_CODE in tests/slurm/CMakeLists.txt).
    echo "slurm fixture: needs root (apt-get and the daemons): skipped" >&2
    exit 77
  fi
  local started=$EPOCHREALTIME dir daemon
  dir=$(realpath "$1")
  slurm_fixture_install || return 1
  # Daemons already running would answer instead of ours, and slurm_stop's final check could
  # not tell them apart from leftovers of ours: refuse rather than guess.
  for daemon in "${slurm_fixture_daemons[@]}"; do
    if pgrep -x "$daemon" >/dev/null; then
      echo "slurm fixture: a $daemon is already running (pid $(pgrep -x "$daemon" | paste -sd " "));" \
        "stop it first" >&2
      return 1
    fi
  done
  mkdir -p "$dir/state" "$dir/spool" "$dir/run" "$dir/log"
  slurm_fixture_dir=$dir
  # Stop the cluster at exit whatever the test did; INT and TERM exit so that EXIT runs. An EXIT
  # trap the test set before is kept and runs after the stop.
  # trap -p prints the command shell-quoted: eval unquotes it.
  local previous=""
  eval "previous=$(trap -p EXIT | sed 's/^trap -- //; s/ EXIT$//')"
  trap "slurm_stop; $previous" EXIT
  trap 'exit 130' INT
  trap 'exit 143' TERM

  slurm_fixture_write_conf "$dir"
  export SLURM_CONF=$dir/slurm.conf
  slurm_fixture_start_munged "$dir" || return 1
  # -c: start without the state of an earlier run; -N: the node name configured above.
  slurmctld -c -f "$SLURM_CONF" ||
    { echo "slurm fixture: slurmctld did not start; its log: $dir/log/slurmctld.log" >&2; return 1; }
  slurmd -c -N "$slurm_fixture_node" -f "$SLURM_CONF" ||
    { echo "slurm fixture: slurmd did not start; its log: $dir/log/slurmd.log" >&2; return 1; }

  local deadline=$((SECONDS + 60)) state=""
  while [[ $SECONDS -lt $deadline ]]; do
    state=$(sinfo -h -N -n "$slurm_fixture_node" -o %t 2>/dev/null)
    [[ $state == idle ]] && break
    sleep 0.5
  done
  if [[ $state != idle ]]; then
    echo "slurm fixture: node $slurm_fixture_node not idle after 60 s (state '${state:-none}');" \
      "logs: $dir/log/slurmctld.log $dir/log/slurmd.log" >&2
    return 1
  fi
  echo "slurm fixture: started in $(slurm_fixture_seconds_since "$started") s"
}

# Sends TERM to the daemons whose pid files are given, all at once, and waits up to 15 s for
# them to exit, then KILLs the rest. Together rather than in turn: each takes a second or two.
slurm_fixture_stop_pidfiles() {
  local file pid pids=()
  for file in "$@"; do
    pid=$(cat "$file" 2>/dev/null) && kill -TERM "$pid" 2>/dev/null && pids+=("$pid")
  done
  local deadline=$((SECONDS + 15))
  for pid in "${pids[@]}"; do
    while kill -0 "$pid" 2>/dev/null; do
      if [[ $SECONDS -ge $deadline ]]; then
        echo "slurm fixture: pid $pid ignored TERM for 15 s; killing it" >&2
        kill -KILL "$pid" 2>/dev/null
        sleep 0.2
        break
      fi
      sleep 0.1
    done
  done
}

# slurm_stop: see the top of this file. Returns non-zero when a daemon is still running.
slurm_stop() {
  [[ -z $slurm_fixture_dir ]] && return 0
  local started=$EPOCHREALTIME dir=$slurm_fixture_dir
  # Cancel jobs first so their slurmstepd end with them rather than outliving slurmd. scancel
  # retries for about 20 s when slurmctld is already gone (a failed start): bound it.
  timeout 10 scancel --quiet --user=root 2>/dev/null
  # munged together with the others: each takes about 2 s to exit on TERM, and neither slurmd
  # nor slurmctld needs a credential to shut down (this cluster's state is thrown away anyway).
  slurm_fixture_stop_pidfiles "$dir/run/slurmd.pid" "$dir/run/slurmctld.pid" \
    "$dir/munge/munged.pid"
  slurm_fixture_dir=""
  # slurmstepd of a job may take a moment to notice; slurm_start refused to start beside any
  # other daemon of these names, so whatever is left is ours.
  local deadline=$((SECONDS + 10)) daemon left=()
  while :; do
    left=()
    for daemon in "${slurm_fixture_daemons[@]}"; do
      pgrep -x "$daemon" >/dev/null && left+=("$daemon")
    done
    [[ ${#left[@]} -eq 0 || $SECONDS -ge $deadline ]] && break
    sleep 0.2
  done
  if [[ ${#left[@]} -ne 0 ]]; then
    echo "slurm fixture: ERROR: still running after stop: ${left[*]}" >&2
    return 1
  fi
  echo "slurm fixture: stopped in $(slurm_fixture_seconds_since "$started") s"
}
