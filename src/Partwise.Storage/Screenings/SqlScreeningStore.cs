using System.Globalization;
using Partwise.Storage.Database;
using Partwise.Storage.Flags;

namespace Partwise.Storage.Screenings;

/// <summary><see cref="IScreeningStore"/> on either provider.</summary>
internal sealed class SqlScreeningStore : IScreeningStore, IAsyncDisposable
{
    private readonly StoreDatabase database;
    private readonly ChangeWatcher watcher;
    private readonly ScreeningWriter writer;

    public SqlScreeningStore(StoreDatabase database, ChangeWatcher watcher)
    {
        this.database = database;
        this.watcher = watcher;
        writer = new ScreeningWriter(database);
    }

    /// <summary>The writer's commits and the calls they held.</summary>
    internal (long Commits, long Calls) WriterCounts => writer.Counts;

    /// <summary>Writes what is queued, then stops taking calls.</summary>
    public ValueTask DisposeAsync() => writer.DisposeAsync();

    public Task<ScreeningBatchResult> RecordAsync(string baselineId, ScreeningEntry entry, CancellationToken cancellationToken) =>
        RecordBatchAsync(baselineId, [entry], cancellationToken);

    public async Task<ScreeningBatchResult> RecordBatchAsync(string baselineId, IReadOnlyList<ScreeningEntry> entries, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(baselineId);
        ArgumentNullException.ThrowIfNull(entries);
        if (entries.Count == 0)
        {
            throw new ArgumentException("There is nothing to record.", nameof(entries));
        }

        foreach (var entry in entries)
        {
            Validate(entry);
        }

        var (result, token) = await writer.WriteAsync(baselineId, entries, cancellationToken);
        if (token is { } committed)
        {
            watcher.Observe(committed);
        }

        return result;
    }

    public Task<StoredScreening?> GetAsync(string baselineId, string sampleId, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(baselineId);
        ArgumentNullException.ThrowIfNull(sampleId);
        return database.ReadAsync(async (connection, ct) =>
        {
            await using var select = ScreeningStatements.Select(connection, null);
            select.Set("@baselineId", baselineId);
            select.Set("@sampleId", sampleId);
            return await ScreeningStatements.ReadStoredAsync(select, database.Dialect, ct);
        }, cancellationToken);
    }

    private static void Validate(ScreeningEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        if (string.IsNullOrWhiteSpace(entry.SampleId))
        {
            throw new ArgumentException("A screening needs a sample id.", nameof(entry));
        }

        if (string.IsNullOrWhiteSpace(entry.Fingerprint))
        {
            throw new ArgumentException($"The screening of '{entry.SampleId}' has no fingerprint.", nameof(entry));
        }

        if (string.IsNullOrWhiteSpace(entry.ResultJson))
        {
            throw new ArgumentException($"The screening of '{entry.SampleId}' has no result.", nameof(entry));
        }

        if (entry.Flag is { } flag)
        {
            if (!double.IsFinite(flag.Distance) || flag.Distance < 0)
            {
                throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"The flag of '{entry.SampleId}' has distance {flag.Distance}; it must be finite and non-negative."), nameof(entry));
            }

            if (!(flag.PValue is >= 0 and <= 1))
            {
                throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"The flag of '{entry.SampleId}' has p-value {flag.PValue}; it must lie in [0, 1]."), nameof(entry));
            }

            if (string.IsNullOrWhiteSpace(flag.ReasonsJson))
            {
                throw new ArgumentException($"The flag of '{entry.SampleId}' has no reasons (an empty JSON array is '[]').", nameof(entry));
            }
        }
    }
}
