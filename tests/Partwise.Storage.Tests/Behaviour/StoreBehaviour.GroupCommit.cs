using System.Data.Common;
using System.Globalization;
using Partwise.Storage.Flags;
using Partwise.Storage.Screenings;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

// The screening writer's group commit: calls queued while a commit is under way are written together, each with the
// outcome it would have had alone.
public abstract partial class StoreBehaviour
{
    [StoreFact]
    public async Task CallsQueuedBehindABusyDatabaseShareOneCommitEachWithItsOwnOutcome()
    {
        var baseline = await CreateBaselineAsync();
        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("earlier"), CancellationToken.None);
        var before = Store.ScreeningWriterCounts;

        var calls = new List<Task<ScreeningBatchResult>>();
        await using (await HoldScreeningWritesAsync())
        {
            // Queued synchronously while the database refuses writes: the writer can take at most one group before
            // the lock goes, and every call after it waits for the next.
            for (var i = 0; i < 20; i++)
            {
                calls.Add(Store.Screenings.RecordAsync(baseline.Id, Samples.Entry(Id("single", i), flagged: i % 3 == 0), CancellationToken.None));
            }

            var conflicting = Store.Screenings.RecordBatchAsync(
                baseline.Id,
                [Samples.Entry("with-conflict/new", flagged: true), Samples.Entry("earlier", sodium: 99)],
                CancellationToken.None);
            var duplicateOfEarlier = Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("earlier"), CancellationToken.None);
            var first = Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("posted-twice", flagged: true), CancellationToken.None);
            var second = Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("posted-twice", flagged: true), CancellationToken.None);
            var unknownBaseline = Store.Screenings.RecordAsync("no-such-baseline", Samples.Entry("elsewhere"), CancellationToken.None);
            calls.AddRange([conflicting, duplicateOfEarlier, first, second, unknownBaseline]);

            await Task.Delay(300);
            Assert.All(calls, c => Assert.False(c.IsCompleted, "a call completed while the database refused writes"));
        }

        var results = await Task.WhenAll(calls);
        var after = Store.ScreeningWriterCounts;

        Assert.Equal(25, after.Calls - before.Calls);
        Assert.InRange(after.Commits - before.Commits, 1, 2);
        for (var i = 0; i < 20; i++)
        {
            Assert.Equal(ScreeningBatchStatus.Committed, results[i].Status);
            Assert.Equal(ScreeningOutcomeKind.Recorded, Assert.Single(results[i].Outcomes).Kind);
            Assert.NotNull(await Store.Screenings.GetAsync(baseline.Id, Id("single", i), CancellationToken.None));
        }

        // The conflicting call is rolled back alone: its new sample is not stored, the calls around it are.
        Assert.Equal(ScreeningBatchStatus.Conflict, results[20].Status);
        Assert.Equal([ScreeningOutcomeKind.NotRecorded, ScreeningOutcomeKind.Conflict], results[20].Outcomes.Select(o => o.Kind));
        Assert.Null(await Store.Screenings.GetAsync(baseline.Id, "with-conflict/new", CancellationToken.None));

        Assert.Equal(ScreeningOutcomeKind.Duplicate, Assert.Single(results[21].Outcomes).Kind);

        // The same sample twice in one group: recorded by the first call, a duplicate of it for the second.
        var recorded = Assert.Single(results[22].Outcomes);
        var repeated = Assert.Single(results[23].Outcomes);
        Assert.Equal(ScreeningOutcomeKind.Recorded, recorded.Kind);
        Assert.Equal(ScreeningOutcomeKind.Duplicate, repeated.Kind);
        Assert.Equal(recorded.Stored, repeated.Stored);

        Assert.Equal(ScreeningBatchStatus.BaselineNotFound, results[24].Status);

        // One flag per flagged sample that was recorded: 7 of the 20 singles and posted-twice once; none for the
        // rolled-back call. Their sequence numbers are distinct and follow the order the calls were queued in.
        var flags = await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any, Limit: 500), CancellationToken.None);
        Assert.Equal(8, flags.Items.Count);
        Assert.DoesNotContain(flags.Items, f => f.SampleId == "with-conflict/new");
        Assert.Equal(flags.Items.Count, flags.Items.Select(f => f.Sequence).Distinct().Count());
        var expectedOrder = Enumerable.Range(0, 20).Where(i => i % 3 == 0).Select(i => Id("single", i)).Append("posted-twice");
        Assert.Equal(expectedOrder, flags.Items.OrderBy(f => f.Sequence).Select(f => f.SampleId));
    }

    [StoreFact]
    public async Task ClosingTheStoreWritesEveryCallAlreadyQueued()
    {
        var baseline = await CreateBaselineAsync();
        var replica = Open();
        var calls = Enumerable.Range(0, 40)
            .Select(i => replica.Screenings.RecordAsync(baseline.Id, Samples.Entry(Id("closing", i), flagged: i % 4 == 0), CancellationToken.None))
            .ToList();

        await replica.DisposeAsync();

        var results = await Task.WhenAll(calls);
        Assert.All(results, r => Assert.Equal(ScreeningBatchStatus.Committed, r.Status));
        for (var i = 0; i < 40; i++)
        {
            Assert.NotNull(await Store.Screenings.GetAsync(baseline.Id, Id("closing", i), CancellationToken.None));
        }

        await Assert.ThrowsAsync<StorageUnavailableException>(
            () => replica.Screenings.RecordAsync(baseline.Id, Samples.Entry("after-closing"), CancellationToken.None));
    }

    [StoreFact]
    public async Task ACallCancelledWhileQueuedIsEitherStoredAndReportedOrNeitherWhenTheStoreIsBusy()
    {
        var baseline = await CreateBaselineAsync();
        using var cancel = new CancellationTokenSource();
        Task<ScreeningBatchResult> kept, cancelled;
        await using (await HoldScreeningWritesAsync())
        {
            kept = Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("kept"), CancellationToken.None);
            cancelled = Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("cancelled"), cancel.Token);
            await cancel.CancelAsync();
        }

        Assert.Equal(ScreeningBatchStatus.Committed, (await kept).Status);
        var stored = await Store.Screenings.GetAsync(baseline.Id, "cancelled", CancellationToken.None);
        // Whether the writer had taken it before the cancellation is a race; what it reported must match what is stored.
        try
        {
            var result = await cancelled;
            Assert.Equal(ScreeningOutcomeKind.Recorded, Assert.Single(result.Outcomes).Kind);
            Assert.NotNull(stored);
        }
        catch (OperationCanceledException)
        {
            Assert.Null(stored);
        }
    }

    /// <summary>
    /// Holds a lock that makes the screening writer wait (SQLite: the database's write lock; PostgreSQL: a table lock
    /// that conflicts with inserts into screenings) until the returned handle is disposed.
    /// </summary>
    private async Task<IAsyncDisposable> HoldScreeningWritesAsync()
    {
        var connection = await Store.Database.Dialect.OpenAsync(CancellationToken.None);
        var transaction = await connection.BeginTransactionAsync();
        if (Store.Provider == "postgresql")
        {
            await using var lockTable = connection.CreateCommand();
            lockTable.Transaction = transaction;
            lockTable.CommandText = "LOCK TABLE screenings IN SHARE MODE";
            await lockTable.ExecuteNonQueryAsync();
        }

        return new HeldLock(connection, transaction);
    }

    private static string Id(string prefix, int i) => string.Create(CultureInfo.InvariantCulture, $"{prefix}/{i:00}");

    private sealed class HeldLock(DbConnection connection, DbTransaction transaction) : IAsyncDisposable
    {
        public async ValueTask DisposeAsync()
        {
            await transaction.RollbackAsync();
            await transaction.DisposeAsync();
            await connection.DisposeAsync();
        }
    }
}
