using System.Data.Common;
using System.Globalization;
using Microsoft.Data.Sqlite;

namespace Partwise.Storage.Database;

/// <summary>
/// SQLite in one file, for a single process. Durability: write-ahead log (journal_mode=WAL) with synchronous=FULL
/// (the default; <see cref="StorageOptions.SqliteSynchronous"/> can choose NORMAL).
/// In WAL mode a commit has appended its frames to the -wal file with write() before it returns, so even
/// synchronous=NORMAL survives a killed process (the OS still holds the data); FULL also fsyncs the log at every
/// commit, so an acknowledged screening also survives an OS crash or power loss (given a disk that honours fsync).
/// Writers take the write lock at BEGIN (Microsoft.Data.Sqlite begins IMMEDIATE), so read-then-write transactions
/// never fail half-way with SQLITE_BUSY; waiting for the lock is bounded by the busy timeout.
/// </summary>
internal sealed class SqliteDialect : StoreDialect
{
    private const string TimestampFormat = "yyyy-MM-dd'T'HH:mm:ss.ffffff'Z'";

    // Primary result codes (https://sqlite.org/rescode.html) that mean "cannot be reached or cannot take it now".
    private static readonly HashSet<int> UnavailableCodes =
    [
        5,  // SQLITE_BUSY: locked by another connection past the busy timeout
        6,  // SQLITE_LOCKED
        8,  // SQLITE_READONLY: read-only file system or file
        10, // SQLITE_IOERR: disk I/O error
        11, // SQLITE_CORRUPT
        13, // SQLITE_FULL: disk full
        14, // SQLITE_CANTOPEN
        15, // SQLITE_PROTOCOL
        26, // SQLITE_NOTADB
    ];

    private readonly string directory;
    private readonly string connectionString;

    private readonly string pragmas;

    public SqliteDialect(string dataDirectory, SqliteSynchronous synchronous = SqliteSynchronous.Full)
    {
        // journal_mode is stored in the file (the first connection switches it); synchronous and foreign_keys
        // belong to the connection, so every open sets them again (no I/O).
        pragmas = $"PRAGMA journal_mode=WAL; PRAGMA synchronous={(synchronous == SqliteSynchronous.Normal ? "NORMAL" : "FULL")}; PRAGMA foreign_keys=ON;";
        directory = Path.GetFullPath(dataDirectory);
        FilePath = Path.Combine(directory, StorageOptions.SqliteFileName);
        connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = FilePath,
            Mode = SqliteOpenMode.ReadWriteCreate,
            Cache = SqliteCacheMode.Private,
            Pooling = true,
            // Seconds to wait for a lock held by another connection (and for a command) before SQLITE_BUSY.
            DefaultTimeout = 10,
        }.ToString();
    }

    /// <summary>The full path of the database file.</summary>
    public string FilePath { get; }

    public override string Name => "sqlite";

    public override string MigrationFolder => "Sqlite";

    public override async Task<DbConnection> OpenAsync(CancellationToken cancellationToken)
    {
        try
        {
            Directory.CreateDirectory(directory);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new StorageUnavailableException($"The data directory '{directory}' cannot be created.", ex);
        }

        var connection = new SqliteConnection(connectionString);
        try
        {
            await connection.OpenAsync(cancellationToken);
            await using var setup = connection.CreateCommand();
            setup.CommandText = pragmas;
            await setup.ExecuteNonQueryAsync(cancellationToken);
            return connection;
        }
        catch
        {
            await connection.DisposeAsync();
            throw;
        }
    }

    public override bool IsUnavailable(Exception exception) =>
        exception is SqliteException sqlite && UnavailableCodes.Contains(sqlite.SqliteErrorCode & 0xFF);

    public override void AddTimestamp(DbCommand command, string name, DateTimeOffset? value) =>
        command.Add(name, value?.UtcDateTime.ToString(TimestampFormat, CultureInfo.InvariantCulture));

    public override void SetTimestamp(DbCommand command, string name, DateTimeOffset? value) =>
        command.Set(name, value?.UtcDateTime.ToString(TimestampFormat, CultureInfo.InvariantCulture));

    public override DateTimeOffset ReadTimestamp(DbDataReader reader, int ordinal) =>
        DateTimeOffset.ParseExact(
            reader.GetString(ordinal),
            TimestampFormat,
            CultureInfo.InvariantCulture,
            DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal);

    // A single writer at a time already keeps a retirement out of an open write transaction.
    public override string LockRowForShare => "";

    public override string LockRowForUpdate => "";

    // BEGIN IMMEDIATE already serialises migrations.
    public override string? MigrationLock => null;

    public override string SchemaVersionTable =>
        "CREATE TABLE IF NOT EXISTS schema_version (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at TEXT NOT NULL)";

    public override string SchemaVersionTableExists =>
        "SELECT count(*) FROM sqlite_master WHERE type = 'table' AND name = 'schema_version'";

    public override ValueTask DisposeAsync()
    {
        // Pooled connections keep the file open; release them so the directory can be moved or deleted.
        using var connection = new SqliteConnection(connectionString);
        SqliteConnection.ClearPool(connection);
        return ValueTask.CompletedTask;
    }
}
