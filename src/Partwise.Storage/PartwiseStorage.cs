using Partwise.Storage.Baselines;
using Partwise.Storage.Database;
using Partwise.Storage.Flags;
using Partwise.Storage.Screenings;

namespace Partwise.Storage;

/// <summary>
/// The durable store: baselines, screenings and flags on SQLite or PostgreSQL, chosen by <see cref="StorageOptions"/>.
/// Constructing it opens nothing (no file, no connection); call <see cref="MigrateAsync"/> once at start before
/// using the stores. Thread-safe: one instance serves the whole process.
/// </summary>
public sealed class PartwiseStorage : IAsyncDisposable
{
    private readonly StoreDatabase database;
    private readonly ChangeWatcher watcher;
    private readonly Lazy<int> schemaVersion;
    private readonly SqlScreeningStore screenings;

    /// <summary>Creates the store for <paramref name="options"/>; <paramref name="clock"/> (default: the system clock) stamps creation, screening, review and retirement times.</summary>
    /// <exception cref="ArgumentException">The options are invalid, or the PostgreSQL connection string is malformed.</exception>
    public PartwiseStorage(StorageOptions options, TimeProvider? clock = null)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (options.Validate() is { Count: > 0 } problems)
        {
            throw new ArgumentException(string.Join(" ", problems), nameof(options));
        }

        StoreDialect dialect = options.UsesPostgres
            ? new PostgresDialect(options.PostgresConnectionString!)
            : new SqliteDialect(options.DataDirectory, options.SqliteSynchronous);
        database = new StoreDatabase(dialect, clock ?? TimeProvider.System);
        watcher = new ChangeWatcher(ct => database.ReadAsync(FlagRows.ReadTokenAsync, ct), options.ChangePollInterval);
        schemaVersion = new Lazy<int>(() => Migrations.For(dialect.MigrationFolder).Count);
        Baselines = new SqlBaselineStore(database);
        screenings = new SqlScreeningStore(database, watcher);
        Screenings = screenings;
        Flags = new SqlFlagStore(database, watcher);
    }

    /// <summary>The schema version this code migrates the selected provider to.</summary>
    public int SchemaVersion => schemaVersion.Value;

    /// <summary>"sqlite" or "postgresql".</summary>
    public string Provider => database.Dialect.Name;

    /// <summary>Baseline documents.</summary>
    public IBaselineStore Baselines { get; }

    /// <summary>Screening results, idempotent per (baseline, sample).</summary>
    public IScreeningStore Screenings { get; }

    /// <summary>Flags, their review and change notification.</summary>
    public IFlagStore Flags { get; }

    internal StoreDatabase Database => database;

    /// <summary>
    /// Creates the SQLite directory and file if missing and applies the pending schema migrations, in one
    /// transaction; safe to run again (it then changes nothing) and from several replicas at once. Returns the
    /// schema version.
    /// </summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    public Task<int> MigrateAsync(CancellationToken cancellationToken) => Migrations.ApplyAsync(database, cancellationToken);

    /// <summary>
    /// The readiness probe: completes when the database answers and its schema is migrated to at least
    /// <see cref="SchemaVersion"/>.
    /// </summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached or is not migrated.</exception>
    public async Task PingAsync(CancellationToken cancellationToken)
    {
        var version = await database.ReadAsync(
            (connection, ct) => Migrations.CurrentVersionAsync(connection, database.Dialect, ct),
            cancellationToken);
        if (version < SchemaVersion)
        {
            throw new StorageUnavailableException($"The {Provider} schema is at version {version}, not {SchemaVersion}: migrations have not run.");
        }
    }

    internal (long Commits, long Calls) ScreeningWriterCounts => screenings.WriterCounts;

    /// <summary>Writes the screenings already queued, stops the change poll and releases pooled connections.</summary>
    public async ValueTask DisposeAsync()
    {
        await screenings.DisposeAsync();
        watcher.Dispose();
        await database.Dialect.DisposeAsync();
    }
}
