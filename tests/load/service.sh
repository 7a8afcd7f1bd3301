# Sourced by tests/load/run.sh and tests/load/soak.sh: the Release service as the load scripts run it, and the demo
# baseline they screen against. Expects OUT (the Release output folder), URL, WORK (a scratch folder) and sets PID.

# Starts the service on $URL with the store settings given as NAME=value arguments. Warning-level logs only (a
# console line per request would measure the console); the per-caller rate limits off (0), because wrk is one caller
# at many connections and the scripts measure the service, not the limiter. Returns 1 (with the service's log on
# stderr) when it exits or is not ready within 60 s.
load_start_service() {
    ( cd "$OUT" && exec env "$@" Partwise__Demo__Enabled=false ASPNETCORE_ENVIRONMENT=Production \
        Partwise__RateLimits__Screening__PermitsPerSecond=0 Partwise__RateLimits__Compute__PermitsPerSecond=0 \
        Serilog__MinimumLevel__Default=Warning Serilog__MinimumLevel__Override__Serilog.AspNetCore.RequestLoggingMiddleware=Warning \
        dotnet Partwise.Api.dll --urls "$URL" ) >"$WORK/service.log" 2>&1 &
    PID=$!
    for _ in $(seq 1 120); do
        curl -fsS -o /dev/null --max-time 2 "$URL/readyz" 2>/dev/null && return 0
        kill -0 "$PID" 2>/dev/null || { cat "$WORK/service.log" >&2; return 1; }
        sleep 0.5
    done
    cat "$WORK/service.log" >&2
    return 1
}

# Creates the demo well-11 baseline (8 parts, robust scatter) under the name $1 and prints its id.
load_demo_baseline() {
    local body
    body="$(sed 's/"name": "well-11 2025"/"name": "'"$1"'"/' demo/well-11-baseline.json)"
    curl -fsS -H 'Content-Type: application/json' --data-binary "$body" "$URL/v1/baselines" \
        | /usr/bin/python3 -c 'import json,sys; print(json.load(sys.stdin)["id"])'
}
