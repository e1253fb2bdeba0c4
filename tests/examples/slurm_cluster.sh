#!/usr/bin/env bash
# A real single-node Slurm cluster for the job scripts of examples/slurm (docs/slurm.md).
#
#   tests/examples/slurm_cluster.sh up                  bring munge, slurmctld and slurmd up
#   tests/examples/slurm_cluster.sh down                stop what `up` started
#   tests/examples/slurm_cluster.sh test MEDLOAD SRC    up (unless running), submit.sh on the
#                                                       demo data, wait, compare, down
#
# The cluster is this host alone, as controller and compute node with 2 CPUs, configured
# in $SLURM_STATE (default /tmp/medload-slurm)/slurm.conf; commands reach it through
# SLURM_CONF. It needs root (munged runs as the munge user, the Slurm daemons as root).
# Process tracking by /proc and no task plugin: no cgroups needed, so it runs in a
# container. `test` exits 77 (ctest: skipped) when Slurm or munge is not installed.
set -euo pipefail
state="${SLURM_STATE:-/tmp/medload-slurm}"
export SLURM_CONF="$state/slurm.conf"
node=""  # this host, found by write_conf

installed() {
  command -v sbatch >/dev/null && command -v slurmctld >/dev/null && command -v slurmd >/dev/null &&
    command -v munged >/dev/null
}

write_conf() {
  node="$(hostname -s)"
  mkdir -p "$state/ctld" "$state/d" "$state/log"
  local memory_mb
  memory_mb=$(( $(awk '/MemTotal/ {print $2}' /proc/meminfo) / 1024 - 512 ))
  cat >"$SLURM_CONF" <<CONF
ClusterName=medload-test
SlurmctldHost=$node
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
StateSaveLocation=$state/ctld
SlurmdSpoolDir=$state/d
SlurmctldPidFile=$state/slurmctld.pid
SlurmdPidFile=$state/slurmd.pid
SlurmctldLogFile=$state/log/slurmctld.log
SlurmdLogFile=$state/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core_Memory
MpiDefault=none
ReturnToService=2
SchedulerType=sched/backfill
NodeName=$node CPUs=2 RealMemory=$memory_mb State=UNKNOWN
PartitionName=main Nodes=$node Default=YES MaxTime=INFINITE State=UP
CONF
}

running() { scontrol ping 2>/dev/null | grep -q "is UP"; }

up() {
  if running; then echo "slurm_cluster: a cluster answers at $SLURM_CONF"; return 0; fi
  write_conf
  if ! pgrep -x munged >/dev/null; then
    [[ -s /etc/munge/munge.key ]] || mungekey --create --keyfile=/etc/munge/munge.key
    mkdir -p /run/munge && chown munge:munge /run/munge
    runuser -u munge -- munged
    touch "$state/started-munged"
  fi
  slurmctld -f "$SLURM_CONF"
  slurmd -f "$SLURM_CONF"
  for _ in $(seq 60); do
    if running && sinfo -h -o %T 2>/dev/null | grep -qx idle; then
      echo "slurm_cluster: up ($node, 2 CPUs), SLURM_CONF=$SLURM_CONF"
      return 0
    fi
    sleep 1
  done
  echo "slurm_cluster: the node did not become idle; logs in $state/log" >&2
  sinfo >&2 || true
  return 1
}

down() {
  for daemon in slurmd slurmctld; do
    if [[ -s "$state/$daemon.pid" ]]; then kill "$(cat "$state/$daemon.pid")" 2>/dev/null || true; fi
  done
  if [[ -f "$state/started-munged" && -s /run/munge/munged.pid ]]; then
    kill "$(cat /run/munge/munged.pid)" 2>/dev/null || true
    rm -f "$state/started-munged"
  fi
}

# Runs submit.sh (one store per shard) on the demo data in a job folder, waits for the
# merge job, and compares its cohort with one unsharded run.
run_test() {
  local medload="$1" source_dir="$2"
  started=0  # global: the EXIT trap reads it, and `work`
  installed || { echo "slurm_cluster: Slurm or munge is not installed: skipped"; exit 77; }
  [[ $(id -u) == 0 ]] || { echo "slurm_cluster: needs root to start the daemons: skipped"; exit 77; }
  exec 9>"/tmp/medload-slurm.lock"
  flock 9
  if ! running; then up; started=1; fi
  work="$(mktemp -d /tmp/medload-slurm-run.XXXXXX)"
  trap 'rm -rf "$work"; if [[ $started == 1 ]]; then down; fi' EXIT
  export DATA="$source_dir/demo-patients" STORES="$work/stores" OUT="$work/cohort" FROM=2025-11-30 TO=latest \
    SHARDS=3 MEDLOAD="$medload"
  cd "$work"
  local line merge
  line=$("$source_dir/examples/slurm/submit.sh")
  echo "slurm_cluster: $line"
  merge="${line##* }"
  for _ in $(seq 300); do
    squeue -h -j "$merge" 2>/dev/null | grep -q . || break
    sleep 1
  done
  local job_state
  job_state=$(scontrol show job "$merge" 2>/dev/null | grep -o 'JobState=[A-Z_]*' || true)
  if [[ ! -f "$OUT/cohort.csv" || "$job_state" != "JobState=COMPLETED" ]]; then
    echo "slurm_cluster: no merged cohort ($job_state); job logs:" >&2
    tail -n 20 "$work"/*.log >&2 || true
    exit 1
  fi
  for kind in practices patients dispensing reviews; do
    "$medload" --quiet --db "$work/whole.db" import "$kind" "$DATA/$kind.csv" >/dev/null
  done
  "$medload" --quiet --db "$work/whole.db" --format csv --output "$work/whole.csv" \
    cohort --from "$FROM" --to "$TO" --at-least items=10 --suppress-below 5
  diff "$work/whole.csv" "$OUT/cohort.csv" || { echo "slurm_cluster: the merged cohort differs (diff above)" >&2; exit 1; }
  echo "slurm_cluster: $(ls "$STORES" | wc -l) shard stores, $(ls "$OUT"/shard-*.json | wc -l) shard cohorts," \
    "merged on the cluster: byte for byte the cohort of one store"
}

case "${1:-}" in
  up) up ;;
  down) down ;;
  test) run_test "$2" "$3" ;;
  *) echo "usage: $0 up|down|test MEDLOAD SOURCE_DIR" >&2; exit 1 ;;
esac
