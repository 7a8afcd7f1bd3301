using System.Data;
using System.Data.Common;
using Npgsql;

namespace Partwise.Storage.Database;

/// <summary>
/// PostgreSQL, shared by several replicas. Durability is the server's: a COMMIT returns after its WAL record is
/// flushed (synchronous_commit=on, the default; the store does not lower it). Tables live in the first schema of
/// the connection's search path.
/// </summary>
internal sealed class PostgresDialect : StoreDialect
{
    private readonly NpgsqlDataSource dataSource;

    public PostgresDialect(string connectionString)
    {
        // Parses the connection string (a malformed one throws here, at start) but opens nothing.
        dataSource = NpgsqlDataSource.Create(connectionString);
    }

    public override string Name => "postgresql";

    public override string MigrationFolder => "Postgres";

    public override async Task<DbConnection> OpenAsync(CancellationToken cancellationToken) =>
        await dataSource.OpenConnectionAsync(cancellationToken);

    public override bool IsUnavailable(Exception exception) => exception switch
    {
        PostgresException postgres => IsUnavailableState(postgres.SqlState),
        // Every other Npgsql error is about the connection: refused, reset, timed out, pool exhausted.
        NpgsqlException => true,
        _ => false,
    };

    // 40P01 deadlock_detected, 40001 serialization_failure (PostgreSQL manual, appendix A).
    public override bool IsRetryableTogether(Exception exception) =>
        exception is PostgresException { SqlState: "40P01" or "40001" };

    // SQLSTATE classes (PostgreSQL manual, appendix A): 08 connection exception, 53 insufficient resources (disk full,
    // too many connections), 57P01-57P04 shutdown or database dropped, 58 system (I/O) error, 28 authorisation
    // failure and 3D000 unknown database: the server cannot serve this service now, whatever the request was.
    private static bool IsUnavailableState(string state) =>
        state.StartsWith("08", StringComparison.Ordinal)
        || state.StartsWith("53", StringComparison.Ordinal)
        || state.StartsWith("57P0", StringComparison.Ordinal)
        || state.StartsWith("58", StringComparison.Ordinal)
        || state.StartsWith("28", StringComparison.Ordinal)
        || state == "3D000";

    public override void AddTimestamp(DbCommand command, string name, DateTimeOffset? value)
    {
        var parameter = command.Add(name, value?.ToUniversalTime());
        parameter.DbType = DbType.DateTimeOffset;
    }

    public override void SetTimestamp(DbCommand command, string name, DateTimeOffset? value) =>
        command.Set(name, value?.ToUniversalTime());

    public override DateTimeOffset ReadTimestamp(DbDataReader reader, int ordinal) =>
        reader.GetFieldValue<DateTimeOffset>(ordinal);

    public override string LockRowForShare => " FOR SHARE";

    public override string LockRowForUpdate => " FOR UPDATE";

    // One migrator per schema at a time; the lock ends with the transaction.
    public override string? MigrationLock =>
        "SELECT pg_advisory_xact_lock(hashtext(coalesce(current_schema(), '') || '/partwise-migrations'))";

    public override string SchemaVersionTable =>
        "CREATE TABLE IF NOT EXISTS schema_version (version bigint PRIMARY KEY, name text NOT NULL, applied_at timestamptz NOT NULL)";

    public override string SchemaVersionTableExists =>
        "SELECT count(*) FROM information_schema.tables WHERE table_schema = current_schema() AND table_name = 'schema_version'";

    public override ValueTask DisposeAsync() => dataSource.DisposeAsync();
}
