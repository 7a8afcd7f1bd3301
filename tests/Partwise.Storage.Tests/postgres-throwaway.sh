#!/usr/bin/env bash
# A throwaway PostgreSQL cluster for the storage tests, on 127.0.0.1 only.
#
#   postgres-throwaway.sh start [port] [directory]   initialise (if needed) and start; prints the connection string
#   postgres-throwaway.sh stop  [port] [directory]   stop it and delete the directory and its log
#   postgres-throwaway.sh halt  [port] [directory]   stop it and keep its data (start again resumes it; outage tests)
#   postgres-throwaway.sh status [port] [directory]
#
# Defaults: port 55432, directory /tmp/partwise-pg. Use it as
#   export PARTWISE_POSTGRES="$(bash tests/Partwise.Storage.Tests/postgres-throwaway.sh start)"
#   dotnet test service.sln
#   bash tests/Partwise.Storage.Tests/postgres-throwaway.sh stop
#
# Only the connection string goes to stdout; progress goes to stderr. Installs Debian's postgresql with apt-get
# when no server binaries are found (needs root). PostgreSQL refuses to run as root, so as root the cluster is
# owned and run by the postgres user. The cluster trusts every local connection: never use it for real data.
set -euo pipefail

command="${1:-}"
port="${2:-${PARTWISE_PG_PORT:-55432}}"
directory="${3:-${PARTWISE_PG_DIR:-/tmp/partwise-pg}}"
log="${directory}.log"

say() { echo "postgres-throwaway: $*" >&2; }

usage() {
    echo "usage: $0 start|stop|halt|status [port] [directory]" >&2
    exit 2
}

find_bin() {
    # The newest installed major version of Debian's layout, else whatever is on PATH.
    local dir
    dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)"
    if [[ -n "$dir" && -x "$dir/initdb" && -x "$dir/pg_ctl" ]]; then
        echo "$dir"
    elif command -v initdb >/dev/null 2>&1 && command -v pg_ctl >/dev/null 2>&1; then
        dirname "$(command -v initdb)"
    fi
}

ensure_installed() {
    bin="$(find_bin)"
    if [[ -n "$bin" ]]; then
        return
    fi

    if [[ "$(id -u)" -ne 0 ]]; then
        say "no PostgreSQL server binaries found and not root: install Debian's postgresql package first"
        exit 1
    fi

    say "installing Debian's postgresql"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq >&2
    apt-get install -y -qq postgresql >&2
    bin="$(find_bin)"
    if [[ -z "$bin" ]]; then
        say "postgresql installed but initdb and pg_ctl are not to be found"
        exit 1
    fi
}

# Runs a server binary as the cluster's owner: the postgres user when we are root, else ourselves.
as_owner() {
    if [[ "$(id -u)" -eq 0 ]]; then
        local quoted
        printf -v quoted '%q ' "$@"
        su postgres -s /bin/bash -c "$quoted"
    else
        "$@"
    fi
}

connection_string() {
    echo "Host=127.0.0.1;Port=${port};Username=postgres;Database=postgres;Timeout=15"
}

running() {
    [[ -f "$directory/PG_VERSION" ]] && as_owner "$bin/pg_ctl" -D "$directory" status >/dev/null 2>&1
}

start() {
    ensure_installed
    if running; then
        say "already running in $directory on port $port"
        connection_string
        return
    fi

    if [[ ! -f "$directory/PG_VERSION" ]]; then
        say "initialising $directory with $bin/initdb"
        rm -rf "$directory"
        mkdir -p "$directory"
        if [[ "$(id -u)" -eq 0 ]]; then
            chown postgres: "$directory"
        fi
        chmod 700 "$directory"
        as_owner "$bin/initdb" -D "$directory" -A trust -U postgres --encoding=UTF8 --no-instructions >&2
    fi

    : >"$log"
    if [[ "$(id -u)" -eq 0 ]]; then
        chown postgres: "$log"
    fi

    say "starting on 127.0.0.1:$port (log $log)"
    as_owner "$bin/pg_ctl" -D "$directory" -l "$log" -w -t 60 \
        -o "-p $port -k /tmp -c listen_addresses=127.0.0.1" start >&2
    connection_string
}

stop() {
    bin="$(find_bin)"
    if [[ -n "$bin" ]] && running; then
        say "stopping the cluster in $directory"
        as_owner "$bin/pg_ctl" -D "$directory" -m fast -w stop >&2
    else
        say "no cluster running in $directory"
    fi

    rm -rf "$directory" "$log"
}

halt() {
    bin="$(find_bin)"
    if [[ -n "$bin" ]] && running; then
        say "halting the cluster in $directory (data kept)"
        as_owner "$bin/pg_ctl" -D "$directory" -m fast -w stop >&2
    else
        say "no cluster running in $directory"
    fi
}

status() {
    bin="$(find_bin)"
    if [[ -n "$bin" ]] && running; then
        say "running in $directory on port $port"
        connection_string
    else
        say "not running"
        exit 3
    fi
}

case "$command" in
    start) start ;;
    stop) stop ;;
    halt) halt ;;
    status) status ;;
    *) usage ;;
esac
