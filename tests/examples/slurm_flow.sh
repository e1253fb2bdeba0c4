#!/usr/bin/env bash
# Runs the Slurm job scripts of examples/slurm as plain bash (no Slurm needed: the
# #SBATCH lines are comments, and each array task is given its SLURM_ARRAY_TASK_ID) on
# the demo data: packing, three shard tasks, the merge. The merged cohort must be byte
# for byte the cohort of one unsharded run with the same suppression.
#
#   tests/examples/slurm_flow.sh MEDLOAD SOURCE_DIR
set -euo pipefail
medload="$1"
source_dir="$2"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
for kind in practices patients dispensing reviews; do
  "$medload" --quiet --db "$work/network.db" import "$kind" "$source_dir/demo-patients/$kind.csv" >/dev/null
done
export STORE="$work/network.db" OUT="$work/cohort" FROM=2025-11-30 TO=2026-10-31 SHARDS=3 MEDLOAD="$medload"
scripts="$source_dir/examples/slurm"
bash "$scripts/pack.sbatch" >/dev/null
for task in 1 2 3; do
  SLURM_ARRAY_TASK_ID="$task" bash "$scripts/cohort-shard.sbatch"
done
bash "$scripts/cohort-merge.sbatch"
"$medload" --quiet --db "$STORE" --format csv --output "$work/whole.csv" \
  cohort --from "$FROM" --to "$TO" --at-least items=10 --suppress-below 5
if ! diff "$work/whole.csv" "$OUT/cohort.csv"; then
  echo "slurm_flow: the merged shards differ from one run (diff above)" >&2
  exit 1
fi
# A task run outside an array names what is missing.
if SLURM_ARRAY_TASK_ID= bash "$scripts/cohort-shard.sbatch" 2>"$work/err.txt"; then
  echo "slurm_flow: a shard task without a task id did not fail" >&2
  exit 1
fi
grep -q "submit as an array job" "$work/err.txt" || { cat "$work/err.txt" >&2; exit 1; }
echo "slurm_flow: 3 shards merged into the cohort of one run"
