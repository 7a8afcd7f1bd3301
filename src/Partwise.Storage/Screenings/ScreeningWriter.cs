using System.Data.Common;
using System.Threading.Channels;
using Partwise.Storage.Database;
using Partwise.Storage.Flags;

namespace Partwise.Storage.Screenings;

/// <summary>
/// The one writer of screenings in this process, with group commit. Recording calls queue here; one loop takes every
/// call waiting at that moment and runs them in one transaction, each inside its own savepoint (a call that ends in a
/// conflict rolls back to its savepoint and leaves the others alone), then commits once. Every call's task completes
/// only after that commit has returned, so what a call reports as stored is durable, as with a transaction of its
/// own; what changes is that concurrent calls share one commit (one fsync of the SQLite log, one round trip to
/// PostgreSQL) and never queue for the SQLite write lock. Under no concurrency a group holds one call, so a single
/// caller sees no added delay: the loop does not wait for company.
/// </summary>
internal sealed class ScreeningWriter : IAsyncDisposable
{
    /// <summary>A group stops taking calls at this many; the rest wait for the next commit.</summary>
    internal const int MaxGroupCalls = 256;

    /// <summary>A group stops taking calls once it holds this many entries (a batch of screenings is up to 1,000).</summary>
    internal const int MaxGroupEntries = 4096;

    private const string Savepoint = "screening_call";

    private readonly StoreDatabase database;
    private readonly RecordWork record;
    private readonly Channel<Call> queue = Channel.CreateUnbounded<Call>(new UnboundedChannelOptions { SingleReader = true });
    private readonly Task loop;

    /// <summary>Records one call's entries inside a transaction; <c>Commit</c> false means roll this call back.</summary>
    internal delegate Task<((ScreeningBatchResult Result, ChangeToken? Token) Outcome, bool Commit)> RecordWork(
        DbConnection connection,
        DbTransaction transaction,
        string baselineId,
        IReadOnlyList<ScreeningEntry> entries,
        CancellationToken cancellationToken);

    public ScreeningWriter(StoreDatabase database, RecordWork record)
    {
        this.database = database;
        this.record = record;
        loop = Task.Run(RunAsync);
    }

    /// <summary>The number of commits so far, and of calls they held (for tests and benchmarks of the grouping).</summary>
    internal (long Commits, long Calls) Counts => (Interlocked.Read(ref commits), Interlocked.Read(ref calls));

    private long commits;
    private long calls;

    /// <summary>
    /// Queues the call and completes once it has been committed (or rolled back, for a conflict). A call whose token
    /// is cancelled before its group starts is dropped unstored; once its group has started it is carried through,
    /// because a commit already under way cannot be unmade for one caller.
    /// </summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached, or the store is closing; nothing was stored.</exception>
    public Task<(ScreeningBatchResult Result, ChangeToken? Token)> WriteAsync(
        string baselineId,
        IReadOnlyList<ScreeningEntry> entries,
        CancellationToken cancellationToken)
    {
        cancellationToken.ThrowIfCancellationRequested();
        var call = new Call(baselineId, entries, cancellationToken);
        if (!queue.Writer.TryWrite(call))
        {
            throw new StorageUnavailableException("The store is closing; nothing was stored.");
        }

        return call.Done.Task;
    }

    /// <summary>Stops taking calls and waits until every queued call has been written.</summary>
    public async ValueTask DisposeAsync()
    {
        queue.Writer.TryComplete();
        await loop.ConfigureAwait(false);
    }

    private async Task RunAsync()
    {
        var group = new List<Call>();
        var reader = queue.Reader;
        while (await reader.WaitToReadAsync().ConfigureAwait(false))
        {
            group.Clear();
            var entries = 0;
            while (group.Count < MaxGroupCalls && entries < MaxGroupEntries && reader.TryRead(out var call))
            {
                if (call.CancellationToken.IsCancellationRequested)
                {
                    call.Done.TrySetCanceled(call.CancellationToken);
                    continue;
                }

                group.Add(call);
                entries += call.Entries.Count;
            }

            if (group.Count > 0)
            {
                await WriteGroupAsync(group).ConfigureAwait(false);
            }
        }
    }

    private async Task WriteGroupAsync(List<Call> group)
    {
        try
        {
            var outcomes = await WriteTogetherAsync(group).ConfigureAwait(false);
            Interlocked.Increment(ref commits);
            Interlocked.Add(ref calls, group.Count);
            for (var i = 0; i < group.Count; i++)
            {
                outcomes[i].Complete(group[i]);
            }
        }
        catch (Exception ex) when (group.Count > 1 && database.Dialect.IsRetryableTogether(ex))
        {
            // Two replicas' groups locked the same screening keys in opposite orders (PostgreSQL broke the cycle by
            // aborting this one): nothing of it was stored, so each call is written again in a transaction of its own,
            // whose keys are taken in the one order every single call uses.
            foreach (var call in group)
            {
                await WriteAloneAsync(call).ConfigureAwait(false);
            }
        }
        catch (Exception ex)
        {
            foreach (var call in group)
            {
                call.Done.TrySetException(ex);
            }
        }
    }

    private async Task WriteAloneAsync(Call call)
    {
        try
        {
            var outcome = await database.WriteAsync(
                (connection, transaction, ct) => record(connection, transaction, call.BaselineId, call.Entries, ct),
                CancellationToken.None).ConfigureAwait(false);
            Interlocked.Increment(ref commits);
            Interlocked.Increment(ref calls);
            call.Done.TrySetResult(outcome);
        }
        catch (Exception ex)
        {
            call.Done.TrySetException(ex);
        }
    }

    private Task<CallOutcome[]> WriteTogetherAsync(List<Call> group) =>
        database.WriteAsync<CallOutcome[]>(async (connection, transaction, ct) =>
        {
            if (group.Count == 1)
            {
                var (outcome, commit) = await record(connection, transaction, group[0].BaselineId, group[0].Entries, ct).ConfigureAwait(false);
                return ([CallOutcome.Of(outcome)], commit);
            }

            // The change counter first when any call may raise a flag: the lock order every writer of flags keeps
            // (FlagRows.LockCounterAsync), here for the whole group since its locks are held until the one commit.
            if (group.Exists(c => c.Entries.Any(e => e.Flag is not null)))
            {
                await FlagRows.LockCounterAsync(connection, transaction, database.Dialect, ct).ConfigureAwait(false);
            }

            var outcomes = new CallOutcome[group.Count];
            for (var i = 0; i < group.Count; i++)
            {
                await transaction.SaveAsync(Savepoint, ct).ConfigureAwait(false);
                try
                {
                    var (outcome, commit) = await record(connection, transaction, group[i].BaselineId, group[i].Entries, ct).ConfigureAwait(false);
                    if (commit)
                    {
                        await transaction.ReleaseAsync(Savepoint, ct).ConfigureAwait(false);
                    }
                    else
                    {
                        await transaction.RollbackAsync(Savepoint, ct).ConfigureAwait(false);
                    }

                    outcomes[i] = CallOutcome.Of(outcome);
                }
                catch (Exception ex) when (!database.IsUnavailable(ex, ct) && !database.Dialect.IsRetryableTogether(ex))
                {
                    // This call alone failed (a bug or a constraint no check foresaw): undo its part, keep the rest.
                    await transaction.RollbackAsync(Savepoint, ct).ConfigureAwait(false);
                    outcomes[i] = CallOutcome.Failed(ex);
                }
            }

            return (outcomes, true);
        }, CancellationToken.None);

    private sealed class Call(string baselineId, IReadOnlyList<ScreeningEntry> entries, CancellationToken cancellationToken)
    {
        public string BaselineId { get; } = baselineId;

        public IReadOnlyList<ScreeningEntry> Entries { get; } = entries;

        public CancellationToken CancellationToken { get; } = cancellationToken;

        // Continuations run off the writer's loop, so the next group does not wait for callers' code.
        public TaskCompletionSource<(ScreeningBatchResult, ChangeToken?)> Done { get; } =
            new(TaskCreationOptions.RunContinuationsAsynchronously);
    }

    private readonly record struct CallOutcome((ScreeningBatchResult, ChangeToken?) Outcome, Exception? Error)
    {
        public static CallOutcome Of((ScreeningBatchResult, ChangeToken?) outcome) => new(outcome, null);

        public static CallOutcome Failed(Exception error) => new(default, error);

        public void Complete(Call call)
        {
            if (Error is { } error)
            {
                call.Done.TrySetException(error);
            }
            else
            {
                call.Done.TrySetResult(Outcome);
            }
        }
    }
}
