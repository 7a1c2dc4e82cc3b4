#!/usr/bin/env bash
# Fuzz flowzone's readers for a bounded time each (cargo-fuzz, libFuzzer).
# Not run in CI: it needs a nightly toolchain and builds the crate with
# sanitizer instrumentation (about 15 minutes on 2 cores the first time).
#
# Usage: fuzz/run.sh [TARGET...]     (default: every target)
# Environment: SECONDS_PER_TARGET (default 120), JOBS (1).
# Seeds: the repository's test files and ../shared samples of each kind.
# A crash is saved under fuzz/artifacts/TARGET/; turn it into a regression
# test (tests/data/fuzz/ and a case in tests/it/hostile.rs) before fixing it.
set -euo pipefail
cd "$(dirname "$0")"
ROOT=$(cd .. && pwd)
SECS=${SECONDS_PER_TARGET:-120}
JOBS=${JOBS:-1}
ALL=(las core_csv capillary_csv zones_csv survey_csv config)
if [ "$#" -gt 0 ]; then TARGETS=("$@"); else TARGETS=("${ALL[@]}"); fi

if ! rustup toolchain list | grep -q '^nightly'; then
    echo "fuzz/run.sh: needs a nightly toolchain: rustup toolchain install nightly" >&2
    exit 1
fi
if ! cargo +nightly fuzz --version >/dev/null 2>&1; then
    echo "== installing cargo-fuzz"
    cargo +nightly install cargo-fuzz --locked
fi

seed() { # seed TARGET: copy seed files into the corpus
    local t=$1 dir=corpus/$1
    mkdir -p "$dir"
    case $t in
        las) find "$ROOT/tests/data" "$ROOT/demo-wells" "$ROOT/../shared/las-samples" -iname '*.las' -size -2M 2>/dev/null ;;
        core_csv) ls "$ROOT/demo-wells/core.csv" "$ROOT"/../shared/core-samples/*.csv 2>/dev/null ;;
        capillary_csv) ls "$ROOT/demo-wells/capillary.csv" 2>/dev/null ;;
        zones_csv) ls "$ROOT/demo-wells/zones.csv" "$ROOT"/demo-wells/*tops*.csv 2>/dev/null ;;
        survey_csv) ls "$ROOT"/demo-wells/surveys/*.csv 2>/dev/null ;;
        config) ls "$ROOT"/config/*.toml 2>/dev/null ;;
    esac | while read -r f; do cp "$f" "$dir/seed-$(basename "$f")"; done
}

echo "== build"
for t in "${TARGETS[@]}"; do
    cargo +nightly fuzz build --release "$t" 2>&1 | tail -2
done
printf '%-14s %12s %10s %s\n' target executions seconds result
for t in "${TARGETS[@]}"; do
    seed "$t"
    log=$(mktemp)
    set +e
    cargo +nightly fuzz run --release "$t" "corpus/$t" -- \
        -max_total_time="$SECS" -jobs="$JOBS" -workers="$JOBS" -rss_limit_mb=4096 >"$log" 2>&1
    rc=$?
    set -e
    execs=$(grep -o 'stat::number_of_executed_units: *[0-9]*' "$log" | awk '{s+=$2} END {print s+0}')
    if [ "$execs" = 0 ]; then
        execs=$(grep -o '#[0-9]*' "$log" | tail -1 | tr -d '#')
    fi
    if [ $rc -eq 0 ]; then result="no crash"; else result="CRASH (see fuzz/artifacts/$t, log $log)"; fi
    printf '%-14s %12s %10s %s\n' "$t" "${execs:-?}" "$SECS" "$result"
done
