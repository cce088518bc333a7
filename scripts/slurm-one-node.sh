#!/usr/bin/env bash
# Starts a one-node Slurm on this machine for the tests of `sojourn report --on slurm`
# (docs/distributed.md): munged, slurmctld and slurmd, with every state, spool and log file under
# one folder, then waits until the node is idle.
#
#   scripts/slurm-one-node.sh [DIR]      DIR default: $SOJOURN_SLURM_DIR, else /tmp/sojourn-slurm
#
# Idempotent: when the daemons of DIR already run, it only waits for the node. Last line on
# standard output: `SLURM_CONF=DIR/slurm.conf` (the tests set it for sbatch and squeue). When Slurm
# cannot start, it says why on standard error and exits 1. Made for containers and CI machines
# (runs as root, no systemd, no cgroups, no accounting database).
set -uo pipefail

dir=${1:-${SOJOURN_SLURM_DIR:-/tmp/sojourn-slurm}}
conf="$dir/slurm.conf"
export SLURM_CONF="$conf"

fail() {
  echo "slurm-one-node: $*" >&2
  for log in "$dir/log/slurmctld.log" "$dir/log/slurmd.log"; do
    [ -s "$log" ] && { echo "--- last lines of $log:" >&2; tail -n 5 "$log" >&2; }
  done
  exit 1
}

for exe in munged slurmctld slurmd sinfo sbatch squeue scontrol; do
  command -v "$exe" >/dev/null 2>&1 || [ -x "/usr/sbin/$exe" ] || fail "$exe is not installed (Debian packages slurm-wlm and munge)."
done
export PATH="$PATH:/usr/sbin"
[ "$(id -u)" = 0 ] || fail "this script runs the daemons as root (SlurmUser=root); run it as root."

node_idle() {
  local state
  state=$(sinfo -h -N -o '%T' 2>/dev/null | head -n 1)
  [ "$state" = idle ] || [ "$state" = mixed ] || [ "$state" = allocated ]
}

wait_idle() {
  for _ in $(seq 1 60); do
    node_idle && { echo "SLURM_CONF=$conf"; exit 0; }
    # a node that was down (an earlier slurmd stopped) is brought back
    scontrol update nodename="$(hostname -s)" state=resume >/dev/null 2>&1 || true
    sleep 1
  done
  fail "the node did not become idle within 60 s (sinfo: $(sinfo -h -N -o '%N %T %E' 2>&1 | head -n 1))."
}

running() { [ -s "$dir/$1.pid" ] && kill -0 "$(cat "$dir/$1.pid")" 2>/dev/null; }

if running slurmctld && running slurmd; then wait_idle; fi

mkdir -p "$dir/state" "$dir/spool" "$dir/log" || fail "cannot create $dir."

# munge: a key if there is none, its run folder, the daemon as the munge user
key=/etc/munge/munge.key
if [ ! -s "$key" ]; then
  mkdir -p /etc/munge
  if command -v mungekey >/dev/null 2>&1 || [ -x /usr/sbin/mungekey ]; then mungekey --create --keyfile="$key" || fail "mungekey could not create $key."
  else dd if=/dev/urandom of="$key" bs=1 count=1024 2>/dev/null || fail "cannot write $key."; fi
  chown munge:munge "$key" 2>/dev/null || true
  chmod 400 "$key"
fi
if ! munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1; then
  mkdir -p /run/munge /var/log/munge /var/lib/munge
  chown munge:munge /run/munge /var/log/munge /var/lib/munge /etc/munge 2>/dev/null || true
  if id munge >/dev/null 2>&1 && command -v runuser >/dev/null 2>&1; then runuser -u munge -- munged || fail "munged did not start."
  else munged --force || fail "munged did not start."; fi
  for _ in $(seq 1 10); do munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1 && break; sleep 0.5; done
  munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1 || fail "munged runs but a credential does not decode (munge -n | unmunge)."
fi

# one node: the machine itself, with the CPUs and memory slurmd sees
node=$(hostname -s)
hw=$(slurmd -C 2>/dev/null | head -n 1)
cpus=$(sed -n 's/.*CPUs=\([0-9]*\).*/\1/p' <<<"$hw")
mem=$(sed -n 's/.*RealMemory=\([0-9]*\).*/\1/p' <<<"$hw")
[ -n "$cpus" ] && [ -n "$mem" ] || fail "slurmd -C did not print the node's CPUs and memory ($hw)."

cat >"$conf.new" <<EOF
# Written by scripts/slurm-one-node.sh: a one-node cluster for tests.
ClusterName=sojourn-test
SlurmctldHost=$node
SlurmUser=root
SlurmdUser=root
SlurmctldPort=6917
SlurmdPort=6918
AuthType=auth/munge
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/slurmctld.pid
SlurmdPidFile=$dir/slurmd.pid
SlurmctldLogFile=$dir/log/slurmctld.log
SlurmdLogFile=$dir/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_Core_Memory
ReturnToService=2
MinJobAge=300
MaxArraySize=100001
KillWait=5
NodeName=$node CPUs=$cpus RealMemory=$mem State=UNKNOWN
PartitionName=debug Nodes=$node Default=YES MaxTime=INFINITE State=UP
EOF
mv "$conf.new" "$conf"

running slurmctld || { slurmctld -f "$conf" || fail "slurmctld did not start."; }
running slurmd || { slurmd -f "$conf" || fail "slurmd did not start."; }
wait_idle
