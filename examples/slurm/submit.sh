#!/bin/bash
# Submits the shard-then-merge flow to Slurm: packing, then an array of SHARDS cohort
# tasks once packing succeeded, then the merge once every task succeeded (afterok on the
# array waits for all its tasks).
#
#   STORE=/shared/network.db OUT=/shared/cohort FROM=2025-11-30 TO=2026-10-31 \
#     SHARDS=16 examples/slurm/submit.sh
#
# The variables are those of the three job scripts beside this one; sbatch passes the
# environment on (--export=ALL).
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
: "${STORE:?}" "${OUT:?}" "${FROM:?}" "${TO:?}" "${SHARDS:?set SHARDS, the number of array tasks}"
export STORE OUT FROM TO SHARDS
pack=$(sbatch --parsable --export=ALL "$here/pack.sbatch")
array=$(sbatch --parsable --export=ALL --dependency="afterok:$pack" --array="1-$SHARDS" \
  "$here/cohort-shard.sbatch")
merge=$(sbatch --parsable --export=ALL --dependency="afterok:$array" "$here/cohort-merge.sbatch")
echo "packing job $pack, shard array $array (1-$SHARDS), merge job $merge"
