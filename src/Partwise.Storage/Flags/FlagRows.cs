using System.Data.Common;
using System.Globalization;
using Partwise.Storage.Database;

namespace Partwise.Storage.Flags;

/// <summary>The SQL shared by the screening and flag stores: the change counter and flag rows.</summary>
internal static class FlagRows
{
    public const string Columns =
        "seq, id, baseline_id, sample_id, observed_at, source, screened_at, distance, p_value, reasons, status, review_note, reviewer, reviewed_at, sample_values";

    /// <summary>
    /// Bumps the change counter by one inside <paramref name="transaction"/> and returns the new token. The row's
    /// write lock is held until the transaction ends, so transactions that bump it commit in counter order: a flag
    /// whose sequence comes from the counter is visible before any flag with a greater one.
    /// </summary>
    public static async Task<ChangeToken> BumpAsync(DbConnection connection, DbTransaction transaction, CancellationToken cancellationToken)
    {
        await using var bump = connection.Command(transaction, BumpSql);
        return await ReadBumpAsync(bump, cancellationToken);
    }

    /// <summary>The statement of <see cref="BumpAsync"/>.</summary>
    public const string BumpSql = "UPDATE store_info SET change_counter = change_counter + 1 WHERE id = 1 RETURNING epoch, change_counter";

    /// <summary>Runs a command of <see cref="BumpSql"/> and returns the new token.</summary>
    public static async Task<ChangeToken> ReadBumpAsync(DbCommand bump, CancellationToken cancellationToken)
    {
        await using var reader = await bump.ExecuteReaderAsync(cancellationToken);
        if (!await reader.ReadAsync(cancellationToken))
        {
            throw new InvalidOperationException("The store_info row is missing: the schema was not migrated.");
        }

        return new ChangeToken(reader.GetString(0), reader.GetInt64(1));
    }

    /// <summary>
    /// Takes the change counter's write lock without changing it. Every write transaction that raises or reviews
    /// flags takes this lock before any other row lock (then screening keys in ordinal order of sample id), so two
    /// such transactions never wait for each other in a cycle.
    /// </summary>
    public static async Task LockCounterAsync(DbConnection connection, DbTransaction transaction, StoreDialect dialect, CancellationToken cancellationToken)
    {
        await using var select = connection.Command(transaction, LockCounterSql(dialect));
        _ = await select.ExecuteScalarAsync(cancellationToken);
    }

    /// <summary>The statement of <see cref="LockCounterAsync"/>.</summary>
    public static string LockCounterSql(StoreDialect dialect) => $"SELECT change_counter FROM store_info WHERE id = 1{dialect.LockRowForUpdate}";

    /// <summary>The current change token.</summary>
    public static async Task<ChangeToken> ReadTokenAsync(DbConnection connection, CancellationToken cancellationToken)
    {
        await using var select = connection.Command(null, "SELECT epoch, change_counter FROM store_info WHERE id = 1");
        await using var reader = await select.ExecuteReaderAsync(cancellationToken);
        if (!await reader.ReadAsync(cancellationToken))
        {
            throw new InvalidOperationException("The store_info row is missing: the schema was not migrated.");
        }

        return new ChangeToken(reader.GetString(0), reader.GetInt64(1));
    }

    /// <summary>Reads a row selected with <see cref="Columns"/>.</summary>
    public static FlagRecord Read(DbDataReader reader, StoreDialect dialect)
    {
        if (!FlagStatusNames.TryParseStatus(reader.GetString(10), out var status))
        {
            throw new InvalidOperationException($"The flag status '{reader.GetString(10)}' is not one the store writes.");
        }

        var review = reader.IsDBNull(13)
            ? null
            : new FlagReview(status, reader.GetNullableString(11), reader.GetNullableString(12), dialect.ReadTimestamp(reader, 13));
        return new FlagRecord(
            Id: reader.GetString(1),
            Sequence: reader.GetInt64(0),
            BaselineId: reader.GetString(2),
            SampleId: reader.GetString(3),
            ObservedAt: ReadObservedAt(reader, 4),
            Source: reader.GetNullableString(5),
            ScreenedAt: dialect.ReadTimestamp(reader, 6),
            Distance: reader.GetDouble(7),
            PValue: reader.GetDouble(8),
            ReasonsJson: reader.GetString(9),
            Status: status,
            Review: review,
            ValuesJson: reader.GetNullableString(14));
    }

    /// <summary>observed_at is round-trip text so that the caller's offset survives.</summary>
    public static string? WriteObservedAt(DateTimeOffset? value) => value?.ToString("O", CultureInfo.InvariantCulture);

    /// <summary>Reads a column written by <see cref="WriteObservedAt"/>.</summary>
    public static DateTimeOffset? ReadObservedAt(DbDataReader reader, int ordinal) =>
        reader.IsDBNull(ordinal)
            ? null
            : DateTimeOffset.ParseExact(reader.GetString(ordinal), "O", CultureInfo.InvariantCulture, DateTimeStyles.RoundtripKind);
}
