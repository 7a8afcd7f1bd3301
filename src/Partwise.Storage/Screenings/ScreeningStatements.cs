using System.Data.Common;
using Partwise.Storage.Database;
using Partwise.Storage.Flags;

namespace Partwise.Storage.Screenings;

/// <summary>
/// The statements that record screenings, made once per connection and kept: the writer holds its connection across
/// groups, so each statement is parsed and planned once (SQLite keeps a command's prepared statement while the
/// command lives) instead of once per call.
/// </summary>
internal sealed class ScreeningStatements : IAsyncDisposable
{
    internal const string Columns = "sample_id, fingerprint, result, screened_at, flag_id, observed_at, source";

    private readonly StoreDialect dialect;
    private readonly DbCommand baseline;
    private readonly DbCommand insert;
    private readonly DbCommand flag;
    private readonly DbCommand select;
    private readonly DbCommand bump;
    private readonly DbCommand lockCounter;
    private readonly DbCommand savepoint;
    private readonly DbCommand release;
    private readonly DbCommand rollbackTo;

    public ScreeningStatements(DbConnection connection, StoreDialect dialect)
    {
        this.dialect = dialect;
        Connection = connection;

        // Checked inside the transaction (on PostgreSQL the row is share-locked), so a retirement either happens
        // before this check or waits until this transaction has committed.
        baseline = connection.Command(null, $"SELECT retired_at FROM baselines WHERE id = @id{dialect.LockRowForShare}");
        baseline.Add("@id", null);

        insert = connection.Command(
            null,
            """
            INSERT INTO screenings (baseline_id, sample_id, fingerprint, observed_at, source, screened_at, result, flag_id)
            VALUES (@baselineId, @sampleId, @fingerprint, @observedAt, @source, @screenedAt, @result, @flagId)
            ON CONFLICT (baseline_id, sample_id) DO NOTHING
            RETURNING seq
            """);
        insert.Add("@baselineId", null);
        insert.Add("@sampleId", null);
        insert.Add("@fingerprint", null);
        insert.Add("@observedAt", null);
        insert.Add("@source", null);
        dialect.AddTimestamp(insert, "@screenedAt", null);
        insert.Add("@result", null);
        insert.Add("@flagId", null);

        flag = connection.Command(
            null,
            """
            INSERT INTO flags (seq, id, baseline_id, sample_id, observed_at, source, screened_at, distance, p_value, reasons, status, sample_values)
            VALUES (@seq, @id, @baselineId, @sampleId, @observedAt, @source, @screenedAt, @distance, @pValue, @reasons, 'open', @sampleValues)
            """);
        flag.Add("@seq", 0L);
        flag.Add("@id", null);
        flag.Add("@baselineId", null);
        flag.Add("@sampleId", null);
        flag.Add("@observedAt", null);
        flag.Add("@source", null);
        dialect.AddTimestamp(flag, "@screenedAt", null);
        flag.Add("@distance", 0.0);
        flag.Add("@pValue", 0.0);
        flag.Add("@reasons", null);
        flag.Add("@sampleValues", null);

        select = Select(connection, null);
        bump = connection.Command(null, FlagRows.BumpSql);
        lockCounter = connection.Command(null, FlagRows.LockCounterSql(dialect));
        savepoint = connection.Command(null, "SAVEPOINT screening_call");
        release = connection.Command(null, "RELEASE SAVEPOINT screening_call");
        rollbackTo = connection.Command(null, "ROLLBACK TO SAVEPOINT screening_call");
    }

    /// <summary>The connection the statements belong to.</summary>
    public DbConnection Connection { get; }

    private IEnumerable<DbCommand> All => [baseline, insert, flag, select, bump, lockCounter, savepoint, release, rollbackTo];

    /// <summary>A SELECT of one stored screening by <c>@baselineId</c> and <c>@sampleId</c>.</summary>
    public static DbCommand Select(DbConnection connection, DbTransaction? transaction)
    {
        var command = connection.Command(transaction, $"SELECT {Columns} FROM screenings WHERE baseline_id = @baselineId AND sample_id = @sampleId");
        command.Add("@baselineId", null);
        command.Add("@sampleId", null);
        return command;
    }

    /// <summary>Puts every statement in <paramref name="transaction"/> (the connection's current one).</summary>
    public void Enlist(DbTransaction transaction)
    {
        foreach (var command in All)
        {
            command.Transaction = transaction;
        }
    }

    /// <summary>Whether the baseline exists and is active, locking it against retirement where the provider can.</summary>
    public async Task<ScreeningBatchStatus> BaselineStatusAsync(string baselineId, CancellationToken ct)
    {
        baseline.Set("@id", baselineId);
        await using var reader = await baseline.ExecuteReaderAsync(ct);
        if (!await reader.ReadAsync(ct))
        {
            return ScreeningBatchStatus.BaselineNotFound;
        }

        return reader.IsDBNull(0) ? ScreeningBatchStatus.Committed : ScreeningBatchStatus.BaselineRetired;
    }

    /// <summary>Inserts the screening unless (baseline, sample id) is stored already; true when it was new.</summary>
    public async Task<bool> TryInsertAsync(string baselineId, ScreeningEntry entry, string? observedAt, DateTimeOffset screenedAt, string? flagId, CancellationToken ct)
    {
        insert.Set("@baselineId", baselineId);
        insert.Set("@sampleId", entry.SampleId);
        insert.Set("@fingerprint", entry.Fingerprint);
        insert.Set("@observedAt", observedAt);
        insert.Set("@source", entry.Source);
        dialect.SetTimestamp(insert, "@screenedAt", screenedAt);
        insert.Set("@result", entry.ResultJson);
        insert.Set("@flagId", flagId);
        return await insert.ExecuteScalarAsync(ct) is not null and not DBNull;
    }

    /// <summary>Inserts the open flag of a screening just recorded, with its sequence from the change counter.</summary>
    public async Task InsertFlagAsync(
        long sequence,
        string flagId,
        string baselineId,
        ScreeningEntry entry,
        ScreeningFlag raised,
        string? observedAt,
        DateTimeOffset screenedAt,
        CancellationToken ct)
    {
        flag.Set("@seq", sequence);
        flag.Set("@id", flagId);
        flag.Set("@baselineId", baselineId);
        flag.Set("@sampleId", entry.SampleId);
        flag.Set("@observedAt", observedAt);
        flag.Set("@source", entry.Source);
        dialect.SetTimestamp(flag, "@screenedAt", screenedAt);
        flag.Set("@distance", raised.Distance);
        flag.Set("@pValue", raised.PValue);
        flag.Set("@reasons", raised.ReasonsJson);
        flag.Set("@sampleValues", raised.ValuesJson);
        await flag.ExecuteNonQueryAsync(ct);
    }

    /// <summary>The stored screening of (baseline, sample id) as this transaction sees it, or null.</summary>
    public Task<StoredScreening?> ReadAsync(string baselineId, string sampleId, CancellationToken ct)
    {
        select.Set("@baselineId", baselineId);
        select.Set("@sampleId", sampleId);
        return ReadStoredAsync(select, dialect, ct);
    }

    /// <summary>Bumps the change counter (see <see cref="FlagRows.BumpAsync"/>).</summary>
    public Task<ChangeToken> BumpAsync(CancellationToken ct) => FlagRows.ReadBumpAsync(bump, ct);

    /// <summary>Takes the change counter's write lock (see <see cref="FlagRows.LockCounterAsync"/>).</summary>
    public async Task LockCounterAsync(CancellationToken ct) => _ = await lockCounter.ExecuteScalarAsync(ct);

    /// <summary>Marks where one call of a group begins, so that its writes alone can be undone.</summary>
    public Task SavepointAsync(CancellationToken ct) => savepoint.ExecuteNonQueryAsync(ct);

    /// <summary>Keeps the writes since <see cref="SavepointAsync"/>.</summary>
    public Task ReleaseAsync(CancellationToken ct) => release.ExecuteNonQueryAsync(ct);

    /// <summary>Undoes the writes since <see cref="SavepointAsync"/> (and ends the savepoint).</summary>
    public async Task RollbackToSavepointAsync(CancellationToken ct)
    {
        await rollbackTo.ExecuteNonQueryAsync(ct);
        await release.ExecuteNonQueryAsync(ct);
    }

    /// <summary>Reads the row of a <see cref="Select"/> command, or null.</summary>
    public static async Task<StoredScreening?> ReadStoredAsync(DbCommand select, StoreDialect dialect, CancellationToken ct)
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
            ScreenedAt: dialect.ReadTimestamp(reader, 3),
            FlagId: reader.GetNullableString(4),
            ObservedAt: FlagRows.ReadObservedAt(reader, 5),
            Source: reader.GetNullableString(6));
    }

    public async ValueTask DisposeAsync()
    {
        foreach (var command in All)
        {
            await command.DisposeAsync();
        }
    }
}
