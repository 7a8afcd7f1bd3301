using System.Data.Common;

namespace Partwise.Storage.Database;

/// <summary>
/// Runs units of work on fresh (pooled) connections, each write in one transaction, and turns provider errors that
/// mean "unreachable" into <see cref="StorageUnavailableException"/>. Cancellation passes through as
/// <see cref="OperationCanceledException"/>; other exceptions pass through unchanged.
/// </summary>
internal sealed class StoreDatabase(StoreDialect dialect, TimeProvider clock)
{
    public StoreDialect Dialect { get; } = dialect;

    /// <summary>The store's clock, UTC, cut to whole microseconds (what both providers keep).</summary>
    public DateTimeOffset Now()
    {
        var now = clock.GetUtcNow().UtcTicks;
        return new DateTimeOffset(now - (now % 10), TimeSpan.Zero);
    }

    /// <summary>Runs <paramref name="work"/> on a connection without an explicit transaction.</summary>
    public async Task<T> ReadAsync<T>(Func<DbConnection, CancellationToken, Task<T>> work, CancellationToken cancellationToken)
    {
        try
        {
            await using var connection = await Dialect.OpenAsync(cancellationToken);
            return await work(connection, cancellationToken);
        }
        catch (Exception ex) when (IsUnavailable(ex, cancellationToken))
        {
            throw Unavailable(ex);
        }
    }

    /// <summary>
    /// Runs <paramref name="work"/> in a write transaction and commits it when the work asks to; the task completes
    /// only after the commit has returned, so what it reports as stored is durable. A failure or a request not to
    /// commit rolls everything back.
    /// </summary>
    public async Task<T> WriteAsync<T>(
        Func<DbConnection, DbTransaction, CancellationToken, Task<(T Result, bool Commit)>> work,
        CancellationToken cancellationToken)
    {
        try
        {
            await using var connection = await Dialect.OpenAsync(cancellationToken);
            await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
            var (result, commit) = await work(connection, transaction, cancellationToken);
            if (commit)
            {
                // Once the work is done the commit is not cancelled: a cancelled commit would leave the caller
                // unsure whether its data were stored.
                await transaction.CommitAsync(CancellationToken.None);
            }
            else
            {
                await transaction.RollbackAsync(CancellationToken.None);
            }

            return result;
        }
        catch (Exception ex) when (IsUnavailable(ex, cancellationToken))
        {
            throw Unavailable(ex);
        }
    }

    /// <summary>True when <paramref name="exception"/> means the database cannot be reached (and is not the caller's own cancellation).</summary>
    internal bool IsUnavailable(Exception exception, CancellationToken cancellationToken) =>
        exception is not StorageUnavailableException
        && !(exception is OperationCanceledException && cancellationToken.IsCancellationRequested)
        && (Dialect.IsUnavailable(exception) || exception is TimeoutException);

    /// <summary>The exception that reports <paramref name="exception"/> as the database being unavailable.</summary>
    internal StorageUnavailableException Unavailable(Exception exception) =>
        new($"The {Dialect.Name} database is unavailable: {exception.Message}", exception);
}
