using System.Data.Common;

namespace Partwise.Storage.Database;

/// <summary>
/// What differs between the providers. The statements the stores run are written once, in the SQL that SQLite
/// (3.35 or later) and PostgreSQL share: <c>@name</c> parameters, <c>INSERT … ON CONFLICT … RETURNING</c>,
/// <c>LIMIT</c>; the schema itself is one script set per provider.
/// </summary>
internal abstract class StoreDialect : IAsyncDisposable
{
    /// <summary>"sqlite" or "postgresql".</summary>
    public abstract string Name { get; }

    /// <summary>The folder under Migrations/ holding this provider's scripts.</summary>
    public abstract string MigrationFolder { get; }

    /// <summary>Opens a connection ready for use; provider exceptions pass through for <see cref="IsUnavailable"/>.</summary>
    public abstract Task<DbConnection> OpenAsync(CancellationToken cancellationToken);

    /// <summary>True when <paramref name="exception"/> means the database cannot be reached or cannot take the operation now.</summary>
    public abstract bool IsUnavailable(Exception exception);

    /// <summary>
    /// True when <paramref name="exception"/> aborted a transaction only because of how it met concurrent ones (a
    /// deadlock broken by the server, a serialization failure): nothing of it was stored, and the same work run again
    /// on its own can succeed.
    /// </summary>
    public virtual bool IsRetryableTogether(Exception exception) => false;

    /// <summary>Binds a timestamp (UTC) or null in the provider's column type.</summary>
    public abstract void AddTimestamp(DbCommand command, string name, DateTimeOffset? value);

    /// <summary>Sets the value of a timestamp parameter added by <see cref="AddTimestamp"/> (its provider type stays).</summary>
    public abstract void SetTimestamp(DbCommand command, string name, DateTimeOffset? value);

    /// <summary>Reads a timestamp column written by <see cref="AddTimestamp"/>.</summary>
    public abstract DateTimeOffset ReadTimestamp(DbDataReader reader, int ordinal);

    /// <summary>Appended to a SELECT of a baseline row that must hold off its retirement until the transaction ends.</summary>
    public abstract string LockRowForShare { get; }

    /// <summary>Appended to a SELECT of a row that the transaction will update, to take its write lock now.</summary>
    public abstract string LockRowForUpdate { get; }

    /// <summary>A statement run first in the migration transaction so that replicas starting together migrate one at a time, or null.</summary>
    public abstract string? MigrationLock { get; }

    /// <summary>CREATE TABLE IF NOT EXISTS for the table of applied migrations.</summary>
    public abstract string SchemaVersionTable { get; }

    /// <summary>A scalar query: 1 when the schema_version table exists, else 0.</summary>
    public abstract string SchemaVersionTableExists { get; }

    /// <inheritdoc />
    public virtual ValueTask DisposeAsync() => ValueTask.CompletedTask;
}
