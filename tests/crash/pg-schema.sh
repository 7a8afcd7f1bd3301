# Sourced by the crash and load scripts: a schema of their own on the PostgreSQL of $PARTWISE_POSTGRES, so that
# they leave the public schema (which the storage suite checks is empty) alone.
#   pg_schema_create NAME   creates the schema; prints the connection string with "Search Path=NAME"
#   pg_schema_drop NAME     drops it with everything in it

pg_psql() {
    local psql
    psql="$(command -v psql || ls /usr/lib/postgresql/*/bin/psql 2>/dev/null | sort -V | tail -n 1 || true)"
    if [[ -z "$psql" ]]; then
        echo "pg-schema: no psql found (Debian's postgresql-client)" >&2
        return 1
    fi

    # Host, Port, Username and Database of an Npgsql connection string; the throwaway cluster trusts local connections.
    local host port user db
    host="$(sed -nE 's/.*(^|;)Host=([^;]*).*/\2/p' <<<"$PARTWISE_POSTGRES")"
    port="$(sed -nE 's/.*(^|;)Port=([^;]*).*/\2/p' <<<"$PARTWISE_POSTGRES")"
    user="$(sed -nE 's/.*(^|;)Username=([^;]*).*/\2/p' <<<"$PARTWISE_POSTGRES")"
    db="$(sed -nE 's/.*(^|;)Database=([^;]*).*/\2/p' <<<"$PARTWISE_POSTGRES")"
    "$psql" -X -q -v ON_ERROR_STOP=1 -h "${host:-127.0.0.1}" -p "${port:-5432}" -U "${user:-postgres}" -d "${db:-postgres}" -c "SET client_min_messages = warning; $1" >&2
}

pg_schema_create() {
    pg_psql "CREATE SCHEMA \"$1\"" && echo "${PARTWISE_POSTGRES%;};Search Path=$1"
}

pg_schema_drop() {
    pg_psql "DROP SCHEMA IF EXISTS \"$1\" CASCADE" || true
}
