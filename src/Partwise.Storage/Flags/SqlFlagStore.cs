using System.Text;
using Partwise.Storage.Database;

namespace Partwise.Storage.Flags;

/// <summary><see cref="IFlagStore"/> on either provider.</summary>
internal sealed class SqlFlagStore(StoreDatabase database, ChangeWatcher watcher) : IFlagStore
{
    public Task<FlagPage> ListAsync(FlagQuery query, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(query);
        ArgumentOutOfRangeException.ThrowIfLessThan(query.Limit, 1, nameof(query));
        ArgumentOutOfRangeException.ThrowIfGreaterThan(query.Limit, FlagQuery.MaxLimit, nameof(query));
        return database.ReadAsync(async (connection, ct) =>
        {
            // The token is read before the items (each statement sees what was committed when it started): a flag
            // committed in between is listed with an older token, so a wait on that token returns at once and the
            // caller lists again; the other order could hide the flag from a waiter until the next change.
            var token = await FlagRows.ReadTokenAsync(connection, ct);
            watcher.Observe(token);

            var sql = new StringBuilder($"SELECT {FlagRows.Columns} FROM flags WHERE 1 = 1");
            await using var select = connection.CreateCommand();
            if (query.BaselineId is { } baselineId)
            {
                sql.Append(" AND baseline_id = @baselineId");
                select.Add("@baselineId", baselineId);
            }

            if (query.Status != FlagStatusFilter.Any)
            {
                sql.Append(" AND status = @status");
                select.Add("@status", FlagStatusNames.ToName(StatusOf(query.Status)));
            }

            if (query.After is { } after)
            {
                sql.Append(" AND seq > @after");
                select.Add("@after", after.Sequence);
            }

            // One more than asked tells whether more follow.
            sql.Append(" ORDER BY seq LIMIT @limit");
            select.Add("@limit", query.Limit + 1);
            select.CommandText = sql.ToString();

            var items = new List<FlagRecord>(Math.Min(query.Limit + 1, 64));
            await using (var reader = await select.ExecuteReaderAsync(ct))
            {
                while (await reader.ReadAsync(ct))
                {
                    items.Add(FlagRows.Read(reader, database.Dialect));
                }
            }

            var hasMore = items.Count > query.Limit;
            if (hasMore)
            {
                items.RemoveAt(items.Count - 1);
            }

            var next = items.Count > 0 ? new FlagCursor(items[^1].Sequence) : query.After;
            return new FlagPage(items, next, hasMore, token);
        }, cancellationToken);
    }

    public Task<FlagRecord?> GetAsync(string id, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(id);
        return database.ReadAsync(async (connection, ct) =>
        {
            await using var select = connection.Command(null, $"SELECT {FlagRows.Columns} FROM flags WHERE id = @id");
            select.Add("@id", id);
            await using var reader = await select.ExecuteReaderAsync(ct);
            return await reader.ReadAsync(ct) ? FlagRows.Read(reader, database.Dialect) : null;
        }, cancellationToken);
    }

    public async Task<FlagRecord?> ReviewAsync(string id, FlagStatus status, string? note, string? reviewer, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(id);
        if (status is not (FlagStatus.Confirmed or FlagStatus.Dismissed))
        {
            throw new ArgumentException("A review confirms or dismisses a flag.", nameof(status));
        }

        var (flag, token) = await database.WriteAsync<(FlagRecord?, ChangeToken?)>(async (connection, transaction, ct) =>
        {
            // The counter first, as everywhere (see FlagRows.LockCounterAsync); an unknown flag rolls the bump back.
            var bumped = await FlagRows.BumpAsync(connection, transaction, ct);
            await using var update = connection.Command(
                transaction,
                $"""
                UPDATE flags SET status = @status, review_note = @note, reviewer = @reviewer, reviewed_at = @reviewedAt
                WHERE id = @id
                RETURNING {FlagRows.Columns}
                """);
            update.Add("@id", id);
            update.Add("@status", FlagStatusNames.ToName(status));
            update.Add("@note", note);
            update.Add("@reviewer", reviewer);
            database.Dialect.AddTimestamp(update, "@reviewedAt", database.Now());
            await using var reader = await update.ExecuteReaderAsync(ct);
            return await reader.ReadAsync(ct)
                ? ((FlagRows.Read(reader, database.Dialect), bumped), true)
                : ((null, null), false);
        }, cancellationToken);

        if (token is { } committed)
        {
            watcher.Observe(committed);
        }

        return flag;
    }

    public Task<ChangeToken> GetChangeTokenAsync(CancellationToken cancellationToken) =>
        database.ReadAsync(FlagRows.ReadTokenAsync, cancellationToken);

    public async Task<ChangeToken> WaitForChangeAsync(ChangeToken since, TimeSpan timeout, CancellationToken cancellationToken)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(timeout, TimeSpan.Zero);
        var current = await GetChangeTokenAsync(cancellationToken);
        watcher.Observe(current);
        if (current.IsLaterThan(since) || timeout == TimeSpan.Zero)
        {
            return current;
        }

        return await watcher.WaitAsync(since, timeout, cancellationToken);
    }

    private static FlagStatus StatusOf(FlagStatusFilter filter) => filter switch
    {
        FlagStatusFilter.Open => FlagStatus.Open,
        FlagStatusFilter.Confirmed => FlagStatus.Confirmed,
        FlagStatusFilter.Dismissed => FlagStatus.Dismissed,
        _ => throw new ArgumentOutOfRangeException(nameof(filter), filter, "not a single status"),
    };
}
