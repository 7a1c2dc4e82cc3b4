#!/usr/bin/env bash
# Submit a sharded flowzone field run to Slurm: train once, then N shard
# tasks (a job array), then the merge, each step waiting for the one before.
#
# Usage: CONFIG=/shared/field/field.toml OUT=/shared/flowzone SHARDS=16 \
#            deploy/slurm/submit.sh
# FLOWZONE: the flowzone binary on the compute nodes (default: on PATH).
# Add your site's options (account, partition) to the #SBATCH lines or here.
set -euo pipefail
cd "$(dirname "$0")"
: "${CONFIG:?set CONFIG to the field config}" "${OUT:?set OUT to the shared output folder}"
SHARDS=${SHARDS:-16}
export CONFIG OUT SHARDS FLOWZONE=${FLOWZONE:-flowzone}

train=$(sbatch --parsable --export=ALL train.sbatch)
shards=$(sbatch --parsable --export=ALL --dependency="afterok:$train" \
    --array="1-$SHARDS" shard.sbatch)
merge=$(sbatch --parsable --export=ALL --dependency="afterok:$shards" merge.sbatch)
echo "submitted: train $train, shards $shards (1-$SHARDS), merge $merge" >&2
