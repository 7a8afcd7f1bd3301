using System.Data.Common;
using System.Globalization;
using Partwise.Storage.Database;
using Partwise.Storage.Flags;

namespace Partwise.Storage.Screenings;

/// <summary><see cref="IScreeningStore"/> on either provider.</summary>
internal sealed class SqlScreeningStore(StoreDatabase database, ChangeWatcher watcher) : IScreeningStore
{
    private const string Columns = "sample_id, fingerprint, result, screened_at, flag_id, observed_at, source";

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

        var (result, token) = await database.WriteAsync<(ScreeningBatchResult, ChangeToken?)>(
            (connection, transaction, ct) => RecordAsync(connection, transaction, baselineId, entries, ct),
            cancellationToken);
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
            await using var select = SelectCommand(connection, null);
            select.Set("@baselineId", baselineId);
            select.Set("@sampleId", sampleId);
            return await ReadStoredAsync(select, ct);
        }, cancellationToken);
    }

    private async Task<((ScreeningBatchResult, ChangeToken?), bool)> RecordAsync(
        DbConnection connection,
        DbTransaction transaction,
        string baselineId,
        IReadOnlyList<ScreeningEntry> entries,
        CancellationToken ct)
    {
        var dialect = database.Dialect;

        // Checked inside the transaction (on PostgreSQL the row is share-locked), so a retirement either happens
        // before this check or waits until this transaction has committed.
        await using (var baseline = connection.Command(transaction, $"SELECT retired_at FROM baselines WHERE id = @id{dialect.LockRowForShare}"))
        {
            baseline.Add("@id", baselineId);
            await using var reader = await baseline.ExecuteReaderAsync(ct);
            if (!await reader.ReadAsync(ct))
            {
                return ((new ScreeningBatchResult(ScreeningBatchStatus.BaselineNotFound, []), null), false);
            }

            if (!reader.IsDBNull(0))
            {
                return ((new ScreeningBatchResult(ScreeningBatchStatus.BaselineRetired, []), null), false);
            }
        }

        var screenedAt = database.Now();
        await using var insert = connection.Command(
            transaction,
            """
            INSERT INTO screenings (baseline_id, sample_id, fingerprint, observed_at, source, screened_at, result, flag_id)
            VALUES (@baselineId, @sampleId, @fingerprint, @observedAt, @source, @screenedAt, @result, @flagId)
            ON CONFLICT (baseline_id, sample_id) DO NOTHING
            RETURNING seq
            """);
        insert.Add("@baselineId", baselineId);
        insert.Add("@sampleId", null);
        insert.Add("@fingerprint", null);
        insert.Add("@observedAt", null);
        insert.Add("@source", null);
        dialect.AddTimestamp(insert, "@screenedAt", screenedAt);
        insert.Add("@result", null);
        insert.Add("@flagId", null);

        await using var flag = connection.Command(
            transaction,
            """
            INSERT INTO flags (seq, id, baseline_id, sample_id, observed_at, source, screened_at, distance, p_value, reasons, status, sample_values)
            VALUES (@seq, @id, @baselineId, @sampleId, @observedAt, @source, @screenedAt, @distance, @pValue, @reasons, 'open', @sampleValues)
            """);
        flag.Add("@seq", 0L);
        flag.Add("@id", null);
        flag.Add("@baselineId", baselineId);
        flag.Add("@sampleId", null);
        flag.Add("@observedAt", null);
        flag.Add("@source", null);
        dialect.AddTimestamp(flag, "@screenedAt", screenedAt);
        flag.Add("@distance", 0.0);
        flag.Add("@pValue", 0.0);
        flag.Add("@reasons", null);
        flag.Add("@sampleValues", null);

        await using var select = SelectCommand(connection, transaction);
        select.Set("@baselineId", baselineId);

        // Lock order, after the baseline's share lock and the same in every transaction that writes flags or
        // screenings: the change counter (only when a flag may be raised; reviews take it first too), then the
        // screening keys in ordinal order of sample id. Concurrent batches with overlapping samples (a retry through
        // another replica) then wait for each other instead of deadlocking.
        if (entries.Any(e => e.Flag is not null))
        {
            await FlagRows.LockCounterAsync(connection, transaction, dialect, ct);
        }

        var order = Enumerable.Range(0, entries.Count).OrderBy(i => entries[i].SampleId, StringComparer.Ordinal).ToList();
        var outcomes = new ScreeningOutcome[entries.Count];
        var recordedHere = new HashSet<string>(StringComparer.Ordinal);
        ChangeToken? token = null;
        foreach (var index in order)
        {
            var entry = entries[index];
            var flagId = entry.Flag is null ? null : StoreIds.New();
            var observedAt = FlagRows.WriteObservedAt(entry.ObservedAt);
            insert.Set("@sampleId", entry.SampleId);
            insert.Set("@fingerprint", entry.Fingerprint);
            insert.Set("@observedAt", observedAt);
            insert.Set("@source", entry.Source);
            insert.Set("@result", entry.ResultJson);
            insert.Set("@flagId", flagId);
            if (await insert.ExecuteScalarAsync(ct) is not null and not DBNull)
            {
                if (entry.Flag is { } raised)
                {
                    token = await FlagRows.BumpAsync(connection, transaction, ct);
                    flag.Set("@seq", token.Value.Counter);
                    flag.Set("@id", flagId);
                    flag.Set("@sampleId", entry.SampleId);
                    flag.Set("@observedAt", observedAt);
                    flag.Set("@source", entry.Source);
                    flag.Set("@distance", raised.Distance);
                    flag.Set("@pValue", raised.PValue);
                    flag.Set("@reasons", raised.ReasonsJson);
                    flag.Set("@sampleValues", raised.ValuesJson);
                    await flag.ExecuteNonQueryAsync(ct);
                }

                var stored = new StoredScreening(entry.SampleId, entry.Fingerprint, entry.ResultJson, screenedAt, flagId, entry.ObservedAt, entry.Source);
                outcomes[index] = new ScreeningOutcome(ScreeningOutcomeKind.Recorded, entry.SampleId, stored);
                recordedHere.Add(entry.SampleId);
                continue;
            }

            select.Set("@sampleId", entry.SampleId);
            var existing = await ReadStoredAsync(select, ct)
                ?? throw new InvalidOperationException("A screening that blocked an insert is not there to read.");
            outcomes[index] = string.Equals(existing.Fingerprint, entry.Fingerprint, StringComparison.Ordinal)
                ? new ScreeningOutcome(ScreeningOutcomeKind.Duplicate, entry.SampleId, existing)
                : new ScreeningOutcome(ScreeningOutcomeKind.Conflict, entry.SampleId, null);
        }

        if (outcomes.Any(o => o.Kind == ScreeningOutcomeKind.Conflict))
        {
            // Rolled back: what this call recorded, and duplicates of it within the call, are not stored after all.
            var undone = outcomes
                .Select(o => o.Kind == ScreeningOutcomeKind.Recorded || (o.Kind == ScreeningOutcomeKind.Duplicate && recordedHere.Contains(o.SampleId))
                    ? o with { Kind = ScreeningOutcomeKind.NotRecorded, Stored = null }
                    : o)
                .ToList();
            return ((new ScreeningBatchResult(ScreeningBatchStatus.Conflict, undone), null), false);
        }

        return ((new ScreeningBatchResult(ScreeningBatchStatus.Committed, outcomes), token), true);
    }

    private static DbCommand SelectCommand(DbConnection connection, DbTransaction? transaction)
    {
        var select = connection.Command(transaction, $"SELECT {Columns} FROM screenings WHERE baseline_id = @baselineId AND sample_id = @sampleId");
        select.Add("@baselineId", null);
        select.Add("@sampleId", null);
        return select;
    }

    private async Task<StoredScreening?> ReadStoredAsync(DbCommand select, CancellationToken ct)
    {
        await using var reader = await select.ExecuteReaderAsync(ct);
        if (!await reader.ReadAsync(ct))
        {
            return null;
        }

        return new StoredScreening(
            SampleId: reader.GetString(0),
            Fingerprint: reader.GetString(1),
            ResultJson: reader.GetString(2),
            ScreenedAt: database.Dialect.ReadTimestamp(reader, 3),
            FlagId: reader.GetNullableString(4),
            ObservedAt: FlagRows.ReadObservedAt(reader, 5),
            Source: reader.GetNullableString(6));
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
