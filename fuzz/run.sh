#!/usr/bin/env bash
# Fuzz flowzone's readers for a bounded time each (cargo-fuzz, libFuzzer).
# Not run in CI: it needs a nightly toolchain and an instrumented build of
# the crate and its dependencies (about 10 minutes on 2 cores the first time).
#
# Usage: fuzz/run.sh [TARGET...]     (default: every target)
# Environment: SECONDS_PER_TARGET (default 120), MAX_LEN (bytes per input,
# default 16384), SANITIZER (none or address; default none).
# Build: debug assertions on, so integer overflow and our debug_assert!s count
# as crashes too. No sanitizer by default: flowzone has no unsafe code; the
# unsafe code under the readers is fast-float2's number parsing, so run the
# las target with SANITIZER=address as well (a separate, slower build).
# Seeds: the repository's test files, ../shared samples of each kind,
# fuzz/seeds/TARGET/ (hand-made edge cases) and earlier findings
# (tests/data/fuzz/TARGET-*).
# Results: a line per target on stdout and appended to fuzz/results.txt.
# A crash is saved under fuzz/artifacts/TARGET/; turn it into a regression
# test (tests/data/fuzz/ and a case in tests/it/hostile.rs) before fixing it.
set -euo pipefail
cd "$(dirname "$0")"
ROOT=$(cd .. && pwd)
SECS=${SECONDS_PER_TARGET:-120}
MAX_LEN=${MAX_LEN:-16384}
ALL=(las core_csv core_spwla capillary_csv pressures_csv zones_csv survey_csv config)
if [ "$#" -gt 0 ]; then TARGETS=("$@"); else TARGETS=("${ALL[@]}"); fi
SANITIZER=${SANITIZER:-none}
FLAGS=(--release --sanitizer "$SANITIZER" --debug-assertions)
# a sanitizer build in its own folder: switching would rebuild everything
if [ "$SANITIZER" != none ]; then FLAGS+=(--target-dir "target/sanitizer-$SANITIZER"); fi

if ! rustup toolchain list | grep -q '^nightly'; then
    echo "fuzz/run.sh: needs a nightly toolchain: rustup toolchain install nightly" >&2
    exit 1
fi
if ! cargo +nightly fuzz --version >/dev/null 2>&1; then
    echo "== installing cargo-fuzz"
    cargo +nightly install cargo-fuzz --locked
fi

seed() { # seed TARGET: copy seed files into the corpus (a kind may have none)
    local t=$1 dir=corpus/$1
    mkdir -p "$dir"
    case $t in
        las) find "$ROOT/tests/data" "$ROOT/demo-wells" "$ROOT/../shared/las-samples" -iname '*.las' -size -2M 2>/dev/null || true ;;
        core_csv) ls "$ROOT/demo-wells/core.csv" "$ROOT"/../shared/core-samples/*.csv 2>/dev/null || true ;;
        core_spwla) ls "$ROOT"/../shared/core-samples/*.SPWLA 2>/dev/null || true ;;
        capillary_csv) ls "$ROOT/demo-wells/capillary.csv" 2>/dev/null || true ;;
        pressures_csv) ls "$ROOT/demo-wells/pressures.csv" 2>/dev/null || true ;;
        zones_csv) ls "$ROOT/demo-wells/zones.csv" "$ROOT"/demo-wells/*tops*.csv 2>/dev/null || true ;;
        survey_csv) ls "$ROOT"/demo-wells/surveys/*.csv 2>/dev/null || true ;;
        config) ls "$ROOT"/config/*.toml 2>/dev/null || true ;;
        *) ;;
    esac | while read -r f; do cp "$f" "$dir/seed-$(basename "$f")"; done
    if [ -d "seeds/$t" ]; then cp seeds/"$t"/* "$dir"/; fi
    for f in "$ROOT"/tests/data/fuzz/"$t"-*; do
        if [ -f "$f" ]; then cp "$f" "$dir/"; fi
    done
}

echo "== build"
for t in "${TARGETS[@]}"; do # cargo fuzz build takes one target at a time
    cargo +nightly fuzz build "${FLAGS[@]}" "$t" 2>&1 | tail -2
done
printf '%-14s %12s %8s %8s %s\n' target executions seconds corpus result
for t in "${TARGETS[@]}"; do
    seed "$t"
    log=$(mktemp)
    set +e
    cargo +nightly fuzz run "${FLAGS[@]}" "$t" "corpus/$t" -- \
        -max_total_time="$SECS" -max_len="$MAX_LEN" -rss_limit_mb=4096 \
        -print_final_stats=1 >"$log" 2>&1
    rc=$?
    set -e
    # a log without figures (cargo failed, or the process was killed) must
    # not end the script under set -e: it reports "?" instead
    execs=$( (grep -o 'stat::number_of_executed_units: *[0-9]*' "$log" || true) | awk '{s+=$2} END {print s+0}')
    if [ "$execs" = 0 ]; then
        execs=$( (grep -o '#[0-9]*' "$log" || true) | tail -1 | tr -d '#')
    fi
    corpus=$(find "corpus/$t" -type f | wc -l)
    if [ $rc -eq 0 ]; then result="no crash"; else result="CRASH (see fuzz/artifacts/$t, log $log)"; fi
    line=$(printf '%-14s %12s %8s %8s %s' "$t" "${execs:-?}" "$SECS" "$corpus" "$result (sanitizer $SANITIZER)")
    echo "$line"
    echo "$(date -u +%Y-%m-%dT%H:%MZ) $(git -C "$ROOT" rev-parse --short HEAD) $line" >>results.txt
done
