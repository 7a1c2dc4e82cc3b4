#!/usr/bin/env bash
# Run the three Jobs in order on the current kubectl context and namespace,
# each after the one before has completed.
set -euo pipefail
cd "$(dirname "$0")"
for job in train shards merge; do
    kubectl apply -f "$job-job.yaml"
    kubectl wait --for=condition=complete --timeout=6h "job/flowzone-$job"
done
