#!/usr/bin/env bash
# Load figures for the HTTP path, with Debian's wrk, on the loopback interface only:
#   1. one-sample screening (POST /v1/baselines/{id}/screenings, each sample new, committed to SQLite with
#      synchronous=FULL before the answer) at 1 connection: latency p50 and p99;
#   2. the same screening at 16 connections, and GET /healthz at 16 connections: requests per second and their ratio.
#
#   tests/load/run.sh            (PARTWISE_LOAD_SECONDS per phase, default 10; PARTWISE_LOAD_PORT, default 5482;
#                                 PARTWISE_POSTGRES set: the store is PostgreSQL, in a schema of its own dropped at
#                                 the end, instead of a temporary SQLite file; PARTWISE_LOAD_SQLITE_SYNCHRONOUS=Normal
#                                 measures SQLite without an fsync per commit, default Full)
#
# Builds the service in Release (PARTWISE_LOAD_NO_BUILD=1 to reuse a build), starts it, creates the demo well-11
# baseline (8 parts, robust scatter), runs both phases in the same run and stops the service. Figures depend on the
# machine; compare runs on the same machine only.
set -euo pipefail

cd "$(dirname "${BASH_SOURCE[0]}")/../.."
ROOT="$(pwd)"
PORT="${PARTWISE_LOAD_PORT:-5482}"
DURATION="${PARTWISE_LOAD_SECONDS:-10}"
URL="http://127.0.0.1:$PORT"
WRK="${WRK:-/usr/bin/wrk}"
WORK="$(mktemp -d -t partwise-load.XXXXXX)"
OUT="$ROOT/src/Partwise.Api/bin/Release/net10.0"
PID=""
PG_SCHEMA=""

cleanup() {
    if [[ -n "$PID" ]] && kill -0 "$PID" 2>/dev/null; then kill "$PID" 2>/dev/null || true; wait "$PID" 2>/dev/null || true; fi
    if [[ -n "$PG_SCHEMA" ]]; then pg_schema_drop "$PG_SCHEMA"; fi
    rm -rf "$WORK"
}
trap cleanup EXIT

if [[ "${PARTWISE_LOAD_NO_BUILD:-}" != 1 ]]; then
    dotnet build src/Partwise.Api/Partwise.Api.csproj -c Release --nologo -v quiet >&2
fi

if [[ -n "${PARTWISE_POSTGRES:-}" ]]; then
    # shellcheck source=tests/crash/pg-schema.sh
    source tests/crash/pg-schema.sh
    PG_SCHEMA="partwise_load_$$"
    CONNECTION="$(pg_schema_create "$PG_SCHEMA")"
    STORE=("Partwise__Storage__PostgresConnectionString=$CONNECTION"); PROVIDER=postgresql
else
    STORE=("Partwise__Storage__DataDirectory=$WORK/data" "Partwise__Storage__SqliteSynchronous=${PARTWISE_LOAD_SQLITE_SYNCHRONOUS:-Full}")
    PROVIDER="sqlite, synchronous=${PARTWISE_LOAD_SQLITE_SYNCHRONOUS:-Full}"
fi

# shellcheck source=tests/load/service.sh
source tests/load/service.sh
load_start_service "${STORE[@]}" || exit 1
BASELINE="$(load_demo_baseline "load-$$")"

echo "== $PROVIDER store, baseline $BASELINE, $DURATION s per phase, $(nproc) cores"
# A short warm-up so that the JIT and the connection pool are not measured.
PARTWISE_LOAD_PREFIX="warm$$" "$WRK" -t1 -c1 -d2s -s tests/load/screen.lua "$URL/v1/baselines/$BASELINE/screenings" >/dev/null
"$WRK" -t1 -c4 -d2s "$URL/healthz" >/dev/null

# The service's CPU time (user + system, from /proc/PID/stat) per request of each phase: less sensitive than
# requests per second to what else the machine is doing, so runs on a busy machine still compare the paths.
cpu_ticks() { awk '{print $14 + $15}' "/proc/$PID/stat"; }
requests_of() { awk '/requests in/ {print $1}' "$1"; }
cpu_us_per_request() { awk -v t="$1" -v n="$2" -v hz="$(getconf CLK_TCK)" 'BEGIN { printf "%.1f", t / hz / n * 1e6 }'; }

echo "== one-sample screening, 1 connection"
PARTWISE_LOAD_PREFIX="run$$" "$WRK" -t1 -c1 -d"${DURATION}s" --latency -s tests/load/screen.lua "$URL/v1/baselines/$BASELINE/screenings" | tee "$WORK/screen.txt"
echo "== one-sample screening, 16 connections"
t0="$(cpu_ticks)"
PARTWISE_LOAD_PREFIX="many$$" "$WRK" -t2 -c16 -d"${DURATION}s" --latency -s tests/load/screen.lua "$URL/v1/baselines/$BASELINE/screenings" | tee "$WORK/screen16.txt"
t1="$(cpu_ticks)"
echo "== GET /healthz, 16 connections"
"$WRK" -t2 -c16 -d"${DURATION}s" --latency "$URL/healthz" | tee "$WORK/health.txt"
t2="$(cpu_ticks)"
screen_cpu="$(cpu_us_per_request "$((t1 - t0))" "$(requests_of "$WORK/screen16.txt")")"
health_cpu="$(cpu_us_per_request "$((t2 - t1))" "$(requests_of "$WORK/health.txt")")"

p50="$(awk '$1 == "50%" {print $2}' "$WORK/screen.txt")"
p99="$(awk '$1 == "99%" {print $2}' "$WORK/screen.txt")"
screen_rps="$(awk '/^Requests\/sec/ {print $2}' "$WORK/screen.txt")"
health_rps="$(awk '/^Requests\/sec/ {print $2}' "$WORK/health.txt")"
screen16_rps="$(awk '/^Requests\/sec/ {print $2}' "$WORK/screen16.txt")"
ratio="$(awk -v a="$screen16_rps" -v b="$health_rps" 'BEGIN { printf "%.3f", a / b }')"
echo "== summary ($PROVIDER): screening p50 $p50, p99 $p99 ($screen_rps req/s at 1 connection); at 16 connections screening $screen16_rps req/s, /healthz $health_rps req/s, ratio $ratio"
echo "== service CPU per request at 16 connections: screening $screen_cpu us, /healthz $health_cpu us"
