#!/bin/bash
# Submits the shard-then-merge flow to Slurm and prints the job ids.
#
# One store per shard (DATA set): an array of SHARDS import tasks, each writing and
# packing STORES/shard-K.db; an array of cohort tasks, task K starting once import task
# K succeeded (aftercorr); the merge once every cohort task succeeded (afterok). With
# COUNT_HERE=1 (stores on node-local storage) each import task counts its own shard and
# the merge waits for the import array.
#
#   DATA=/shared/extract STORES=/shared/stores OUT=/shared/cohort FROM=2025-11-30 \
#     TO=latest SHARDS=16 examples/slurm/submit.sh
#
# One store of the whole network (STORE set, DATA not): packing, then the cohort array
# (every task reads the whole store), then the merge.
#
#   STORE=/shared/network.db OUT=/shared/cohort FROM=2025-11-30 TO=2026-10-31 \
#     SHARDS=16 examples/slurm/submit.sh
#
# The variables are those of the job scripts beside this one; sbatch passes the
# environment on (--export=ALL).
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
: "${OUT:?}" "${FROM:?}" "${TO:?}" "${SHARDS:?set SHARDS, the number of array tasks}"
export OUT FROM TO SHARDS
export SCRIPTS="$here"
submit() { sbatch --parsable --export=ALL "$@"; }
if [[ -n "${DATA:-}" ]]; then
  : "${STORES:?set STORES, the folder for the shard stores}"
  export DATA STORES
  unset STORE
  imports=$(submit --array="1-$SHARDS" "$here/shard-import.sbatch")
  if [[ "${COUNT_HERE:-0}" == 1 ]]; then
    merge=$(submit --dependency="afterok:$imports" "$here/cohort-merge.sbatch")
    echo "import and count array $imports (1-$SHARDS), merge job $merge"
    exit 0
  fi
  counts=$(submit --dependency="aftercorr:$imports" --array="1-$SHARDS" "$here/cohort-shard.sbatch")
  merge=$(submit --dependency="afterok:$counts" "$here/cohort-merge.sbatch")
  echo "import array $imports, cohort array $counts (1-$SHARDS), merge job $merge"
else
  : "${STORE:?set DATA and STORES (one store per shard), or STORE (one store)}"
  export STORE
  pack=$(submit "$here/pack.sbatch")
  counts=$(submit --dependency="afterok:$pack" --array="1-$SHARDS" "$here/cohort-shard.sbatch")
  merge=$(submit --dependency="afterok:$counts" "$here/cohort-merge.sbatch")
  echo "packing job $pack, cohort array $counts (1-$SHARDS), merge job $merge"
fi
