#!/usr/bin/env bash
# Hostile input against a live Release service: tests/hostile/run.py (seeded mutated requests over every route of
# the served OpenAPI document, and malformed HTTP framing) against a service started here on 127.0.0.1 with a
# temporary SQLite store; stops it afterwards. Prints run.py's "N passed, N failed"; exits non-zero on any failure.
#
#   tests/hostile/run.sh        (PARTWISE_HOSTILE_PORT, default 5486; PARTWISE_HOSTILE_NO_BUILD=1 reuses a Release
#                                build; PARTWISE_HOSTILE_SEED another seed)
# .ci/run runs run.py directly against the Release service it starts for the reference checks.
set -euo pipefail

cd "$(dirname "${BASH_SOURCE[0]}")/../.."
ROOT="$(pwd)"
PORT="${PARTWISE_HOSTILE_PORT:-5486}"
URL="http://127.0.0.1:$PORT"
WORK="$(mktemp -d -t partwise-hostile.XXXXXX)"
OUT="$ROOT/src/Partwise.Api/bin/Release/net10.0"
PID=""

cleanup() {
    if [[ -n "$PID" ]] && kill -0 "$PID" 2>/dev/null; then kill "$PID" 2>/dev/null || true; wait "$PID" 2>/dev/null || true; fi
    rm -rf "$WORK"
}
trap cleanup EXIT

if [[ "${PARTWISE_HOSTILE_NO_BUILD:-}" != 1 ]]; then
    dotnet build src/Partwise.Api/Partwise.Api.csproj -c Release --nologo -v quiet >&2
fi

( cd "$OUT" && exec env Partwise__Storage__DataDirectory="$WORK/data" Partwise__Storage__PostgresConnectionString="" \
    Partwise__Demo__Enabled=false ASPNETCORE_ENVIRONMENT=Production Serilog__MinimumLevel__Default=Warning \
    dotnet Partwise.Api.dll --urls "$URL" ) >"$WORK/service.log" 2>&1 &
PID=$!
for _ in $(seq 1 120); do
    curl -fsS -o /dev/null --max-time 2 "$URL/readyz" 2>/dev/null && break
    kill -0 "$PID" 2>/dev/null || { tail -n 30 "$WORK/service.log" >&2; echo "0 passed, 1 failed"; exit 1; }
    sleep 0.5
done

set +e
/usr/bin/python3 tests/hostile/run.py "$URL"
rc=$?
set -e
if [[ "$rc" -ne 0 ]]; then
    echo "== the service's errors:" >&2
    grep -E '"@l":"(Error|Fatal)"' "$WORK/service.log" | head -n 5 >&2 || true
fi
exit "$rc"
