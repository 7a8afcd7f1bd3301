#!/usr/bin/env bash
# Fault test: the service rides out a PostgreSQL outage without a restart and loses nothing it acknowledged.
#
#   tests/faults/postgres-outage.sh
#
# Starts a throwaway PostgreSQL (tests/Partwise.Storage.Tests/postgres-throwaway.sh) and the Release service on it,
# creates a baseline and streams single screenings from 4 workers (tests/faults/stream.py), recording every
# 2xx-acknowledged sample and every answer. After a few seconds it halts PostgreSQL (fast shutdown, data kept): the
# screenings must get 503 problem documents of type /problems/storage-unavailable, /readyz 503, a flag long poll 503,
# and nothing may be a 500. Then it starts PostgreSQL again: /readyz must return to 200 and screenings to 2xx without
# a restart of the service, a flag long poll must wake on a new flag, and every acknowledged screening must be there
# (tests/crash/verify.py re-posts each: duplicate: true with the same distance and flag id).
# Prints "N passed, N failed"; exits non-zero on any failure.
# Environment: PARTWISE_OUTAGE_PORT (service, default 5485), PARTWISE_OUTAGE_PG_PORT (default 55434),
# PARTWISE_OUTAGE_NO_BUILD=1 to reuse a Release build, PARTWISE_OUTAGE_KEEP=DIR to keep the answer logs there.
set -euo pipefail

cd "$(dirname "${BASH_SOURCE[0]}")/../.."
ROOT="$(pwd)"
PORT="${PARTWISE_OUTAGE_PORT:-5485}"
PG_PORT="${PARTWISE_OUTAGE_PG_PORT:-55434}"
PG_DIR="/tmp/partwise-outage-pg.$$"
PG_SCRIPT="tests/Partwise.Storage.Tests/postgres-throwaway.sh"
URL="http://127.0.0.1:$PORT"
PY=/usr/bin/python3
WORK="$(mktemp -d -t partwise-outage.XXXXXX)"
OUT="$ROOT/src/Partwise.Api/bin/Release/net10.0"
PID="" STREAM="" PG_STARTED=""
BEFORE=4 DOWN=7 AFTER=10   # seconds of streaming before the outage, of the outage, and after PostgreSQL is back

say() { printf 'outage: %s\n' "$*" >&2; }
cleanup() {
    if [[ -n "$STREAM" ]]; then kill "$STREAM" 2>/dev/null || true; wait "$STREAM" 2>/dev/null || true; fi
    if [[ -n "$PID" ]] && kill -0 "$PID" 2>/dev/null; then kill "$PID" 2>/dev/null || true; wait "$PID" 2>/dev/null || true; fi
    if [[ -n "$PG_STARTED" ]]; then bash "$PG_SCRIPT" stop "$PG_PORT" "$PG_DIR" 2>/dev/null || true; fi
    if [[ -n "${PARTWISE_OUTAGE_KEEP:-}" ]]; then cp "$WORK"/*.jsonl "$PARTWISE_OUTAGE_KEEP"/; fi; rm -rf "$WORK"
}
trap cleanup EXIT

PASSED=0 FAILED=0
check() { if [[ "$1" == 1 ]]; then PASSED=$((PASSED + 1)); say "ok   $2"; else FAILED=$((FAILED + 1)); say "FAIL $2"; fi; }
fail_now() { say "$1"; echo "$PASSED passed, $((FAILED + 1)) failed"; exit 1; }
since() { awk -v s="$T0" -v n="$(date +%s.%N)" 'BEGIN { printf "%.2f", n - s }'; }
# status and problem type of one request: "503 /problems/storage-unavailable"
answer() {
    curl -sS -o "$WORK/body" -w '%{http_code} %{content_type}\n' --max-time 20 "$@" | {
        read -r code ctype
        kind="-"
        if [[ "$ctype" == application/problem+json* ]]; then kind="$("$PY" -c 'import json,sys; print(json.load(open(sys.argv[1])).get("type"))' "$WORK/body")"; fi
        echo "$code $kind"
    }
}

if [[ "${PARTWISE_OUTAGE_NO_BUILD:-}" != 1 ]]; then
    say "building the service in Release"
    dotnet build src/Partwise.Api/Partwise.Api.csproj -c Release --nologo -v quiet >&2
fi

PG_STARTED=1
CONNECTION="$(bash "$PG_SCRIPT" start "$PG_PORT" "$PG_DIR")" || fail_now "PostgreSQL did not start"
( cd "$OUT" && exec env Partwise__Storage__PostgresConnectionString="$CONNECTION" Partwise__Demo__Enabled=false \
    ASPNETCORE_ENVIRONMENT=Production Partwise__RateLimits__Screening__PermitsPerSecond=0 Serilog__MinimumLevel__Override__Serilog.AspNetCore.RequestLoggingMiddleware=Warning \
    dotnet Partwise.Api.dll --urls "$URL" ) >"$WORK/service.log" 2>&1 &
PID=$!
for _ in $(seq 1 120); do
    curl -fsS -o /dev/null --max-time 2 "$URL/readyz" 2>/dev/null && break
    kill -0 "$PID" 2>/dev/null || { tail -n 30 "$WORK/service.log" >&2; fail_now "the service exited during start"; }
    sleep 0.5
done

RUN="outage-$(date +%s)-$$"
BASELINE_BODY='{"name": "'"$RUN"'", "parts": ["a", "b", "c"], "scatter": "classical",
  "rows": [[1.0, 2.0, 4.0], [2.0, 2.1, 3.0], [3.0, 1.2, 2.2], [2.2, 3.0, 2.0], [1.1, 1.0, 1.5], [4.0, 2.2, 3.1], [2.5, 2.6, 2.4], [1.8, 1.4, 3.3]]}'
BASELINE="$(curl -fsS -H 'Content-Type: application/json' --data-binary "$BASELINE_BODY" "$URL/v1/baselines" | "$PY" -c 'import json,sys; print(json.load(sys.stdin)["id"])')"
say "baseline $BASELINE; streaming for $((BEFORE + DOWN + AFTER)) s, PostgreSQL halted from ${BEFORE} s for ${DOWN} s"
ACK="$WORK/acknowledged.jsonl" ANSWERS="$WORK/answers.jsonl"
: >"$ACK"; : >"$ANSWERS"

T0=$(date +%s.%N)
"$PY" tests/faults/stream.py "$URL" "$BASELINE" "$RUN" "$ACK" "$ANSWERS" $((BEFORE + DOWN + AFTER)) 4 "$T0" &
STREAM=$!
sleep "$BEFORE"
T_DOWN=$(since)
bash "$PG_SCRIPT" halt "$PG_PORT" "$PG_DIR"
T_HALTED=$(since)
say "PostgreSQL halting from ${T_DOWN} s, down at ${T_HALTED} s"
sleep 1
read -r code kind < <(answer "$URL/readyz")
check "$([[ "$code" == 503 && "$kind" == /problems/storage-unavailable ]] && echo 1 || echo 0)" "/readyz during the outage: $code $kind"
read -r code kind < <(answer -H 'If-None-Match: "x"' "$URL/v1/flags?waitSeconds=2")
check "$([[ "$code" == 503 && "$kind" == /problems/storage-unavailable ]] && echo 1 || echo 0)" "a flag long poll during the outage: $code $kind"
sleep $((DOWN - 2))
T_UP=$(since)
bash "$PG_SCRIPT" start "$PG_PORT" "$PG_DIR" >/dev/null
say "PostgreSQL started again at ${T_UP} s"
ready=""
for _ in $(seq 1 60); do
    if curl -fsS -o /dev/null --max-time 2 "$URL/readyz" 2>/dev/null; then ready=$(since); break; fi
    sleep 0.5
done
check "$([[ -n "$ready" ]] && echo 1 || echo 0)" "/readyz 200 again without a restart (at ${ready:-never} s, PostgreSQL back at ${T_UP} s)"

# The change watcher survived: a long poll on the current ETag wakes when a new flag is raised.
ETAG="$(curl -sS -D - -o /dev/null --max-time 10 "$URL/v1/flags?status=any&limit=1" | awk -F': ' 'tolower($1) == "etag" {print $2}' | tr -d '\r')"
curl -sS -o /dev/null -w '%{http_code} %{time_total}\n' --max-time 25 -H "If-None-Match: $ETAG" "$URL/v1/flags?status=any&waitSeconds=15" >"$WORK/poll" &
POLL=$!
sleep 1
curl -sS -o /dev/null -H 'Content-Type: application/json' --max-time 10 \
    --data-binary '{"sample": {"id": "'"$RUN"'-far", "values": {"a": 40, "b": 1, "c": 0.5}}}' "$URL/v1/baselines/$BASELINE/screenings"
wait "$POLL" || true
read -r code took <"$WORK/poll"
check "$([[ "$code" == 200 ]] && awk -v t="$took" 'BEGIN { exit !(t < 10) }' && echo 1 || echo 0)" "a flag long poll after the outage wakes on a new flag: $code after ${took} s"

wait "$STREAM" || true
STREAM=""
kill -0 "$PID" 2>/dev/null && alive=1 || alive=0
check "$alive" "the service process ran through the outage (pid $PID)"

# What the stream saw: 2xx before, 503 problem documents during, 2xx after, nothing else at any time.
"$PY" - "$ANSWERS" "$T_DOWN" "$T_HALTED" "$T_UP" >"$WORK/phases" <<'PYEOF'
import json, sys
answers = [json.loads(l) for l in open(sys.argv[1]) if l.strip()]
down, halted, up = float(sys.argv[2]), float(sys.argv[3]), float(sys.argv[4])
ok = lambda a: 200 <= a["status"] < 300
before = sum(1 for a in answers if ok(a) and a["t"] < down)
# Sent after PostgreSQL was down and answered before it was started again.
during = [a for a in answers if a["status"] != 0 and halted <= a["t"] and a["done"] < up]
refused = sum(1 for a in during if a["status"] == 503 and a["type"] == "/problems/storage-unavailable" and a["problem"])
after = sum(1 for a in answers if ok(a) and a["t"] > up)
other = [a for a in answers if not ok(a) and not (a["status"] == 503 and a["type"] == "/problems/storage-unavailable" and a["problem"])]
print(f"{1 if before else 0} screenings acknowledged before the outage: {before}")
print(f"{1 if refused and refused == len(during) else 0} screenings during the outage answered 503 storage-unavailable problem documents: {refused} of {len(during)}")
print(f"{1 if after else 0} screenings acknowledged after PostgreSQL returned: {after}")
print(f"{0 if other else 1} no answer other than 2xx or a 503 storage-unavailable problem document, of {len(answers)}: {len(other)} others {other[:5]}")
PYEOF
while read -r ok text; do check "$ok" "$text"; done <"$WORK/phases"
if grep -q '"StatusCode":500' "$WORK/service.log"; then check 0 "no 500 in the service log"; grep '"@l":"Error"' "$WORK/service.log" | head -n 3 >&2; else check 1 "no 500 in the service log"; fi

set +e
"$PY" tests/crash/verify.py "$URL" "$BASELINE" "$ACK" >"$WORK/verify.log"
set -e
grep -v -E '^[0-9]+ passed, [0-9]+ failed$' "$WORK/verify.log" | head -n 20 >&2 || true
summary="$(grep -E '^[0-9]+ passed, [0-9]+ failed$' "$WORK/verify.log" | tail -n 1)"
if [[ "$summary" =~ ^([0-9]+)\ passed,\ ([0-9]+)\ failed$ ]]; then
    say "every acknowledged screening is there: ${BASH_REMATCH[1]} passed, ${BASH_REMATCH[2]} failed (of $(wc -l <"$ACK") acknowledged, plus the baseline)"
    PASSED=$((PASSED + BASH_REMATCH[1])) FAILED=$((FAILED + BASH_REMATCH[2]))
else
    check 0 "verify.py gave no summary"
fi
echo "$PASSED passed, $FAILED failed"
[[ "$FAILED" -eq 0 ]]
