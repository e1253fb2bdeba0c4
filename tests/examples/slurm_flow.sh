#!/usr/bin/env bash
# Runs the Slurm job scripts of examples/slurm as plain bash (no Slurm needed: the
# #SBATCH lines are comments, and each array task is given its SLURM_ARRAY_TASK_ID) on
# the demo data. One store per shard: three import tasks (--shard K/3, packing), three
# cohort tasks, the merge; then the same with each import task counting its own shard
# (COUNT_HERE=1); then one shared store: packing, three cohort tasks, the merge. Each
# merged cohort must be byte for byte the cohort of one unsharded run with the same
# suppression.
#
#   tests/examples/slurm_flow.sh MEDLOAD SOURCE_DIR
set -euo pipefail
medload="$1"
source_dir="$2"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
scripts="$source_dir/examples/slurm"
export FROM=2025-11-30 TO=2026-10-31 SHARDS=3 MEDLOAD="$medload" SCRIPTS="$scripts"
for kind in practices patients dispensing reviews; do
  "$medload" --quiet --db "$work/network.db" import "$kind" "$source_dir/demo-patients/$kind.csv" >/dev/null
done
"$medload" --quiet --db "$work/network.db" --format csv --output "$work/whole.csv" \
  cohort --from "$FROM" --to "$TO" --at-least items=10 --suppress-below 5

same_as_whole() {
  if ! diff "$work/whole.csv" "$1/cohort.csv"; then
    echo "slurm_flow: $2: the merged shards differ from one run (diff above)" >&2
    exit 1
  fi
}

# One store per shard, imported then counted by two arrays.
export DATA="$source_dir/demo-patients" STORES="$work/stores" OUT="$work/split"
for task in 1 2 3; do SLURM_ARRAY_TASK_ID="$task" bash "$scripts/shard-import.sbatch" >/dev/null; done
for task in 1 2 3; do SLURM_ARRAY_TASK_ID="$task" bash "$scripts/cohort-shard.sbatch"; done
bash "$scripts/cohort-merge.sbatch"
same_as_whole "$OUT" "one store per shard"

# The same, each import task counting its own shard (stores on node-local storage).
export STORES="$work/local" OUT="$work/local-out" COUNT_HERE=1
for task in 1 2 3; do SLURM_ARRAY_TASK_ID="$task" bash "$scripts/shard-import.sbatch" >/dev/null; done
bash "$scripts/cohort-merge.sbatch"
same_as_whole "$OUT" "counted in the import tasks"
unset DATA STORES COUNT_HERE

# One store of the whole network: packing, then every task reads it.
export STORE="$work/network.db" OUT="$work/shared"
bash "$scripts/pack.sbatch" >/dev/null
for task in 1 2 3; do SLURM_ARRAY_TASK_ID="$task" bash "$scripts/cohort-shard.sbatch"; done
bash "$scripts/cohort-merge.sbatch"
same_as_whole "$OUT" "one shared store"

# A task run outside an array names what is missing.
for script in cohort-shard shard-import; do
  if SLURM_ARRAY_TASK_ID= DATA=x STORES=x bash "$scripts/$script.sbatch" 2>"$work/err.txt"; then
    echo "slurm_flow: $script without a task id did not fail" >&2
    exit 1
  fi
  grep -q "submit as an array job" "$work/err.txt" || { cat "$work/err.txt" >&2; exit 1; }
done
echo "slurm_flow: 3 shards (own stores, counted apart or in place, or one shared store) merged into the cohort of one run"
