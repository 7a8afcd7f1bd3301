using System.Threading.Channels;
using Partwise.Storage.Database;
using Partwise.Storage.Flags;

namespace Partwise.Storage.Screenings;

/// <summary>
/// The one writer of screenings in this process, with group commit. Recording calls queue here; one loop takes every
/// call waiting at that moment and runs them in one transaction (a call of several entries inside its own savepoint,
/// so that a conflict undoes that call and leaves the others alone), then commits once. Every call's task completes
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

    private readonly StoreDatabase database;
    private readonly Channel<Call> queue = Channel.CreateUnbounded<Call>(new UnboundedChannelOptions { SingleReader = true });
    private readonly Task loop;
    private long commits;
    private long calls;

    // The writer's own connection and its statements, kept across groups; dropped after a failure and opened again
    // for the next group, so the writer recovers once the database does.
    private ScreeningStatements? statements;

    public ScreeningWriter(StoreDatabase database)
    {
        this.database = database;
        loop = Task.Run(RunAsync);
    }

    /// <summary>The number of commits so far, and of calls they held (for tests of the grouping).</summary>
    internal (long Commits, long Calls) Counts => (Interlocked.Read(ref commits), Interlocked.Read(ref calls));

    /// <summary>
    /// Queues the call and completes once it has been committed (or undone, for a conflict). A call whose token is
    /// cancelled before its group starts is dropped unstored; once its group has started it is carried through,
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

    /// <summary>Stops taking calls, waits until every queued call has been written, and closes the connection.</summary>
    public async ValueTask DisposeAsync()
    {
        queue.Writer.TryComplete();
        await loop.ConfigureAwait(false);
        await DropConnectionAsync().ConfigureAwait(false);
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
        Outcome[] outcomes;
        try
        {
            outcomes = await WriteTogetherAsync(group).ConfigureAwait(false);
        }
        catch (Exception ex) when (ex is StorageUnavailableException || database.IsUnavailable(ex, CancellationToken.None))
        {
            await DropConnectionAsync().ConfigureAwait(false);
            var unavailable = ex as StorageUnavailableException ?? database.Unavailable(ex);
            foreach (var call in group)
            {
                call.Done.TrySetException(unavailable);
            }

            return;
        }
        catch (Exception) when (group.Count > 1)
        {
            // Nothing of the group was stored. Either two replicas' groups locked the same screening keys in opposite
            // orders (PostgreSQL broke the cycle by aborting this one), or one call failed in a way no check foresaw:
            // each call is written again in a transaction of its own, so a failure stays with the call that caused it.
            await DropConnectionAsync().ConfigureAwait(false);
            foreach (var call in group)
            {
                await WriteGroupAsync([call]).ConfigureAwait(false);
            }

            return;
        }
        catch (Exception ex)
        {
            await DropConnectionAsync().ConfigureAwait(false);
            group[0].Done.TrySetException(ex);
            return;
        }

        Interlocked.Increment(ref commits);
        Interlocked.Add(ref calls, group.Count);
        for (var i = 0; i < group.Count; i++)
        {
            group[i].Done.TrySetResult((outcomes[i].Result, outcomes[i].Token));
        }
    }

    /// <summary>
    /// One transaction for the group: first the baselines' status (share-locked on PostgreSQL), then the change
    /// counter's lock when any call may raise a flag, then each call's screening keys: the lock order every writer
    /// keeps (see <see cref="FlagRows.LockCounterAsync"/>), here for the whole group since its locks last until the
    /// one commit.
    /// </summary>
    private async Task<Outcome[]> WriteTogetherAsync(List<Call> group)
    {
        var ct = CancellationToken.None;
        var open = statements ??= new ScreeningStatements(await database.Dialect.OpenAsync(ct).ConfigureAwait(false), database.Dialect);
        await using var transaction = await open.Connection.BeginTransactionAsync(ct).ConfigureAwait(false);
        open.Enlist(transaction);

        var baselines = new Dictionary<string, ScreeningBatchStatus>(StringComparer.Ordinal);
        foreach (var call in group)
        {
            if (!baselines.ContainsKey(call.BaselineId))
            {
                baselines[call.BaselineId] = await open.BaselineStatusAsync(call.BaselineId, ct).ConfigureAwait(false);
            }
        }

        if (group.Exists(c => baselines[c.BaselineId] == ScreeningBatchStatus.Committed && c.Entries.Any(e => e.Flag is not null)))
        {
            await open.LockCounterAsync(ct).ConfigureAwait(false);
        }

        var outcomes = new Outcome[group.Count];
        for (var i = 0; i < group.Count; i++)
        {
            var call = group[i];
            var status = baselines[call.BaselineId];
            if (status != ScreeningBatchStatus.Committed)
            {
                outcomes[i] = new Outcome(new ScreeningBatchResult(status, []), null);
                continue;
            }

            // A call of one entry writes nothing when it conflicts; a call of several needs its own savepoint so
            // that a conflict undoes its earlier entries and nothing of the calls around it.
            var (result, token) = await ScreeningRecorder.RecordAsync(
                open, database.Now(), call.BaselineId, call.Entries, ownSavepoint: call.Entries.Count > 1, ct).ConfigureAwait(false);
            outcomes[i] = new Outcome(result, token);
        }

        // Once the work is done the commit is not cancelled: a cancelled commit would leave callers unsure whether
        // their data were stored.
        await transaction.CommitAsync(ct).ConfigureAwait(false);
        return outcomes;
    }

    private async Task DropConnectionAsync()
    {
        if (statements is { } dropped)
        {
            statements = null;
            try
            {
                await dropped.DisposeAsync().ConfigureAwait(false);
                await dropped.Connection.DisposeAsync().ConfigureAwait(false);
            }
            catch (Exception ex) when (database.IsUnavailable(ex, CancellationToken.None) || ex is InvalidOperationException)
            {
                // A broken connection may refuse to close cleanly; it is gone either way.
            }
        }
    }

    private sealed class Call(string baselineId, IReadOnlyList<ScreeningEntry> entries, CancellationToken cancellationToken)
    {
        public string BaselineId { get; } = baselineId;

        public IReadOnlyList<ScreeningEntry> Entries { get; } = entries;

        public CancellationToken CancellationToken { get; } = cancellationToken;

        // Continuations run off the writer's loop, so the next group does not wait for callers' code.
        public TaskCompletionSource<(ScreeningBatchResult, ChangeToken?)> Done { get; } =
            new(TaskCreationOptions.RunContinuationsAsynchronously);
    }

    private readonly record struct Outcome(ScreeningBatchResult Result, ChangeToken? Token);
}
