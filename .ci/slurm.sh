#!/usr/bin/env bash
# The sweep on a real batch engine: a one-node Slurm cluster on this
# machine (Debian's slurm-wlm and munge, started here as root, all state
# in a temporary folder, ports of its own), the README's sbatch array
# script for a small sweep, the README's collect job, and the collected
# tables checked against a local run of the same sweep. Then the same for
# an array job cancelled halfway and submitted again.
#
# Usage: .ci/slurm.sh [FLANGESEG_BINARY]   (default: builds one)
#
# Only time_s, each case's wall-clock time, may differ between the runs:
# it is the last column of sweep.csv and the "time_s" lines of sweep.json,
# which are masked; report.html (the sweep page) must be equal as it is.
set -euo pipefail
start=$(date +%s)
cd "$(dirname "$0")/.."
repo=$PWD
plan=testdata/sweep/array_plan.toml
cases=8 # of that plan

sudo=""
[ "$(id -u)" -ne 0 ] && sudo="sudo"
if ! command -v slurmctld >/dev/null 2>&1 || ! command -v munged >/dev/null 2>&1; then
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq slurm-wlm munge >/dev/null
fi

work=$(mktemp -d /tmp/flangeseg-slurm.XXXXXX)
chmod 755 "$work"
mkdir -p "$work/bin"
bin=$work/bin/flangeseg
if [ -n "${1:-}" ]; then
  ln -s "$(cd "$(dirname "$1")" && pwd)/$(basename "$1")" "$bin"
else
  go build -o "$bin" ./cmd/flangeseg
fi
export PATH="$work/bin:$PATH"

# --- munge: its own key, socket and files, run as the munge user --------
m=$work/munge
$sudo install -d -o munge -g munge -m 755 "$m"
$sudo mungekey --create --keyfile="$m/munge.key"
$sudo chown munge:munge "$m/munge.key"
$sudo chmod 600 "$m/munge.key"
$sudo runuser -u munge -- munged --socket="$m/socket" --key-file="$m/munge.key" \
  --pid-file="$m/munged.pid" --log-file="$m/munged.log" --seed-file="$m/munged.seed"

# --- Slurm: controller and node daemon as root -------------------------
port=$((20000 + RANDOM % 20000))
host=$(hostname -s)
mkdir -p "$work/state" "$work/spool"
cat >"$work/slurm.conf" <<EOF
ClusterName=flangesegci
SlurmctldHost=$host(127.0.0.1)
SlurmUser=root
SlurmdUser=root
SlurmctldPort=$port
SlurmdPort=$((port + 1))
AuthType=auth/munge
AuthInfo=socket=$m/socket
CredType=cred/munge
StateSaveLocation=$work/state
SlurmdSpoolDir=$work/spool
SlurmctldPidFile=$work/slurmctld.pid
SlurmdPidFile=$work/slurmd.pid
SlurmctldLogFile=$work/slurmctld.log
SlurmdLogFile=$work/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
ReturnToService=2
KillWait=5
SchedulerParameters=bf_interval=1
NodeName=ci NodeHostname=$(hostname) NodeAddr=127.0.0.1 CPUs=$(nproc) State=UNKNOWN
PartitionName=ci Nodes=ci Default=YES MaxTime=INFINITE State=UP
EOF
export SLURM_CONF=$work/slurm.conf

stop_daemons() {
  # Jobs first, so that no job step outlives its node daemon.
  if [ -s "$work/slurmctld.pid" ]; then
    scancel --quiet --partition=ci 2>/dev/null || true
    for _ in $(seq 1 50); do
      [ -z "$(squeue -h 2>/dev/null)" ] && break
      sleep 0.2
    done
  fi
  local pids=""
  for f in "$work/slurmd.pid" "$work/slurmctld.pid" "$m/munged.pid"; do
    if [ -s "$f" ]; then
      pid=$(cat "$f")
      $sudo kill "$pid" 2>/dev/null || true
      pids="$pids $pid"
    fi
  done
  # slurmctld saves its state as it stops: wait for the daemons to be
  # gone, so that removing the work directory does not race with them.
  for pid in $pids; do
    for _ in $(seq 1 100); do
      $sudo kill -0 "$pid" 2>/dev/null || break
      sleep 0.1
    done
  done
}
fail() {
  echo "slurm check: $*" >&2
  for f in "$work"/slurmctld.log "$work"/slurmd.log "$work"/run/*.log; do
    [ -f "$f" ] && { echo "--- $f"; tail -n 20 "$f"; } >&2
  done
  exit 1
}
trap stop_daemons EXIT

$sudo env SLURM_CONF="$SLURM_CONF" slurmctld -c
$sudo env SLURM_CONF="$SLURM_CONF" slurmd -N ci
for _ in $(seq 1 60); do
  state=$(sinfo -h -n ci -o %t 2>/dev/null || true)
  [ "$state" = idle ] && break
  sleep 0.5
done
[ "$state" = idle ] || fail "the node did not come up (state '$state')"
echo "one-node Slurm up: $(sinfo -h -o '%P %D %c %t')"

# The README's sbatch script and collect line, as the README writes them.
script=$work/sweep.sbatch
sed -n '/<!-- sbatch script: begin -->/,/<!-- sbatch script: end -->/p' README.md | sed '/^<!--/d;/^```/d' >"$script"
collect=$(sed -n '/<!-- collect job: begin -->/,/<!-- collect job: end -->/p' README.md | sed '/^<!--/d;/^```/d')
grep -q '^#SBATCH --array' "$script" || fail "no sbatch script found in README.md"
echo "$collect" | grep -q -- '--collect' || fail "no collect job found in README.md"

mkdir -p "$work/run"
# submit OUT: the README's array job, one CPU a task (the CI machine has
# two); prints the job id.
submit() {
  (cd "$work/run" && PLAN=$repo/$plan OUT=$1 sbatch --parsable --cpus-per-task=1 \
    --output="$work/run/%x-%A_%a.log" "$script")
}
# finish JOB: wait for the job (polling: sbatch --wait polls at long
# intervals) and fail unless every task of it exited 0.
finish() {
  for _ in $(seq 1 3000); do
    [ -z "$(squeue -h -j "$1" 2>/dev/null)" ] && break
    sleep 0.1
  done
  local states
  states=$(scontrol -o show job "$1" | grep -o 'JobState=[A-Z]* .*ExitCode=[0-9:]*' | sed 's/JobState=\([A-Z]*\).*ExitCode=\([0-9:]*\)/\1 \2/' | sort -u)
  [ "$states" = "COMPLETED 0:0" ] || fail "job $1 ended: $states"
}
# collect_job OUT JOB: the README's collect job after JOB, waited for.
collect_job() {
  local id
  id=$(cd "$work/run" && PLAN=$repo/$plan OUT=$1 jobid=$2 bash -c "${collect/sbatch /sbatch --parsable --output=$work/run/collect-%j.log }") ||
    fail "the collect job of $1 was not submitted"
  finish "$id"
}
same() { # same DIR_A DIR_B: the tables equal but for time_s
  local a=$1 b=$2
  diff <(sed 's/,[^,]*$//' "$a/sweep.csv") <(sed 's/,[^,]*$//' "$b/sweep.csv") || fail "sweep.csv of $b differs from $a"
  diff <(grep -v '"time_s"' "$a/sweep.json") <(grep -v '"time_s"' "$b/sweep.json") || fail "sweep.json of $b differs from $a"
  cmp "$a/report.html" "$b/report.html" || fail "report.html of $b differs from $a"
  [ "$(head -n 1 "$a/sweep.csv" | sed 's/.*,//')" = time_s ] || fail "time_s is not the last column of sweep.csv"
}

echo "== local run"
SECONDS=0
"$bin" sweep "$plan" -o "$work/local" --jobs 2 >"$work/local.txt" 2>&1 || { cat "$work/local.txt"; fail "the local run failed"; }
tail -n 2 "$work/local.txt"
echo "local run: $SECONDS s wall"

echo "== 4-task array job"
job=$(submit "$work/array")
finish "$job"
collect_job "$work/array" "$job"
same "$work/local" "$work/array"
echo "array job $job: the collected tables equal the local run's (time_s masked)"

echo "== array job cancelled halfway, then submitted again"
job=$(submit "$work/resumed")
for _ in $(seq 1 600); do
  done_now=$(find "$work/resumed/cases" -name case.json 2>/dev/null | wc -l || true)
  [ "$done_now" -ge 1 ] && break
  sleep 0.1
done
scancel "$job"
# A task that was writing a case when the signal came finishes it; wait
# until every task that started has said its last line.
for _ in $(seq 1 100); do
  open=0
  for log in "$work"/run/*-"$job"_*.log; do
    [ -f "$log" ] && ! grep -q -e '^flangeseg sweep: interrupted' -e '^shard ' "$log" && open=1
  done
  [ "$open" -eq 0 ] && [ -z "$(squeue -h -j "$job" 2>/dev/null)" ] && break
  sleep 0.2
done
before=$(find "$work/resumed/cases" -name case.json | wc -l)
echo "cancelled job $job with $before of $cases cases done"
[ "$before" -lt "$cases" ] || fail "every case was done before the cancel: nothing to resume"
job=$(submit "$work/resumed")
finish "$job"
again=$(cat "$work"/run/*-"$job"_*.log | grep -c 'already done' || true)
[ "$again" -eq "$before" ] || fail "the resubmitted job found $again cases done, want $before"
collect_job "$work/resumed" "$job"
same "$work/local" "$work/resumed"
echo "resumed job $job ran the $((cases - before)) missing cases; the tables equal the local run's"
stop_daemons
trap - EXIT
rm -rf "$work"
echo "slurm check: $(($(date +%s) - start)) s wall"
