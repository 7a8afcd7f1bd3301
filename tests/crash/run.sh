#!/usr/bin/env bash
# Crash test: screenings acknowledged with a 2xx survive a SIGKILL of the service.
#
#   tests/crash/run.sh [sqlite|postgres] [rounds]
#
# Builds the service in Release, starts it on 127.0.0.1 (a temporary SQLite data directory, or PostgreSQL from
# $PARTWISE_POSTGRES, in a schema of its own that is dropped at the end), creates a baseline, streams single screenings from 4 workers while recording every
# acknowledged sample id, kills the service with SIGKILL after a few seconds, restarts it, and re-posts every
# acknowledged sample: each must come back as duplicate: true with the same distance and flag id. Repeats for
# `rounds` rounds (default 2) on the same store. Prints "N passed, N failed"; exits non-zero on any loss.
# Environment: PARTWISE_CRASH_PORT (default 5481), PARTWISE_CRASH_SECONDS (stream length before the kill,
# default 4), PARTWISE_CRASH_NO_BUILD=1 to reuse an existing Release build.
set -euo pipefail

cd "$(dirname "${BASH_SOURCE[0]}")/../.."
ROOT="$(pwd)"
PROVIDER="${1:-sqlite}"
ROUNDS="${2:-2}"
PORT="${PARTWISE_CRASH_PORT:-5481}"
SECONDS_BEFORE_KILL="${PARTWISE_CRASH_SECONDS:-4}"
URL="http://127.0.0.1:$PORT"
PY=/usr/bin/python3
WORK="$(mktemp -d -t partwise-crash.XXXXXX)"
OUT="$ROOT/src/Partwise.Api/bin/Release/net10.0"
PID=""
PG_SCHEMA=""

say() { printf 'crash(%s): %s\n' "$PROVIDER" "$*" >&2; }

cleanup() {
    if [[ -n "$PID" ]] && kill -0 "$PID" 2>/dev/null; then kill "$PID" 2>/dev/null || true; wait "$PID" 2>/dev/null || true; fi
    if [[ -n "$PG_SCHEMA" ]]; then pg_schema_drop "$PG_SCHEMA"; fi
    rm -rf "$WORK"
}
trap cleanup EXIT

case "$PROVIDER" in
    sqlite) STORE_ENV=("Partwise__Storage__DataDirectory=$WORK/data") ;;
    postgres)
        if [[ -z "${PARTWISE_POSTGRES:-}" ]]; then say "PARTWISE_POSTGRES is not set"; echo "0 passed, 1 failed"; exit 1; fi
        # shellcheck source=tests/crash/pg-schema.sh
        source tests/crash/pg-schema.sh
        PG_SCHEMA="partwise_crash_$$"
        CONNECTION="$(pg_schema_create "$PG_SCHEMA")" || { echo "0 passed, 1 failed"; exit 1; }
        STORE_ENV=("Partwise__Storage__PostgresConnectionString=$CONNECTION") ;;
    *) echo "usage: $0 [sqlite|postgres] [rounds]" >&2; exit 2 ;;
esac

if [[ "${PARTWISE_CRASH_NO_BUILD:-}" != 1 ]]; then
    say "building the service in Release"
    dotnet build src/Partwise.Api/Partwise.Api.csproj -c Release --nologo -v quiet >&2
fi

start() {
    ( cd "$OUT" && exec env "${STORE_ENV[@]}" Partwise__Demo__Enabled=false ASPNETCORE_ENVIRONMENT=Production \
        dotnet Partwise.Api.dll --urls "$URL" ) >>"$WORK/service.log" 2>&1 &
    PID=$!
    for _ in $(seq 1 120); do
        if ! kill -0 "$PID" 2>/dev/null; then say "the service exited during start"; tail -n 30 "$WORK/service.log" >&2; return 1; fi
        if curl -fsS -o /dev/null --max-time 2 "$URL/readyz" 2>/dev/null; then return 0; fi
        sleep 0.5
    done
    say "not ready within 60 s"; return 1
}

PASSED=0 FAILED=0
start
RUN="crash-$(date +%s)-$$"
BASELINE_BODY='{"name": "'"$RUN"'", "parts": ["a", "b", "c"], "scatter": "classical",
  "rows": [[1.0, 2.0, 4.0], [2.0, 2.1, 3.0], [3.0, 1.2, 2.2], [2.2, 3.0, 2.0], [1.1, 1.0, 1.5], [4.0, 2.2, 3.1], [2.5, 2.6, 2.4], [1.8, 1.4, 3.3]]}'
BASELINE_ID="$(curl -fsS -H 'Content-Type: application/json' --data-binary "$BASELINE_BODY" "$URL/v1/baselines" | "$PY" -c 'import json,sys; print(json.load(sys.stdin)["id"])')"
say "baseline $BASELINE_ID"
ACK="$WORK/acknowledged.jsonl"
: >"$ACK"

for round in $(seq 1 "$ROUNDS"); do
    before=$(wc -l <"$ACK")
    "$PY" tests/crash/stream.py "$URL" "$BASELINE_ID" "$RUN-r$round" "$ACK" 4 &
    STREAM=$!
    sleep "$SECONDS_BEFORE_KILL"
    say "round $round: SIGKILL to the service (pid $PID) mid-stream"
    kill -9 "$PID"
    wait "$PID" 2>/dev/null || true
    PID=""
    wait "$STREAM" || true
    say "round $round: $(( $(wc -l <"$ACK") - before )) screenings acknowledged before the kill; restarting"
    start
done

set +e
"$PY" tests/crash/verify.py "$URL" "$BASELINE_ID" "$ACK" >"$WORK/verify.log"
set -e
grep -v -E '^[0-9]+ passed, [0-9]+ failed$' "$WORK/verify.log" >&2 || true
summary="$(grep -E '^[0-9]+ passed, [0-9]+ failed$' "$WORK/verify.log" | tail -n 1)"
if [[ "$summary" =~ ^([0-9]+)\ passed,\ ([0-9]+)\ failed$ ]]; then
    PASSED=${BASH_REMATCH[1]} FAILED=${BASH_REMATCH[2]}
else
    FAILED=1
fi
if [[ "$(wc -l <"$ACK")" -eq 0 ]]; then say "nothing was acknowledged: the stream never ran"; FAILED=$((FAILED + 1)); fi
echo "$PASSED passed, $FAILED failed"
[[ "$FAILED" -eq 0 ]]
