using System.Diagnostics;
using System.Globalization;
using Partwise.Storage.Flags;
using Partwise.Storage.Screenings;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

public abstract partial class StoreBehaviour
{
    /// <summary>Records <paramref name="count"/> flagged samples, one screening call each, and returns their flag ids in order.</summary>
    private async Task<List<string>> RaiseFlagsAsync(string baselineId, int count, string prefix = "well-07", PartwiseStorage? through = null)
    {
        var ids = new List<string>();
        for (var i = 0; i < count; i++)
        {
            var sampleId = string.Create(CultureInfo.InvariantCulture, $"{prefix}/{i:000}");
            var result = await (through ?? Store).Screenings.RecordAsync(baselineId, Samples.Entry(sampleId, flagged: true), CancellationToken.None);
            ids.Add(result.Outcomes[0].Stored!.FlagId!);
        }

        return ids;
    }

    private async Task<List<FlagRecord>> ReadAllAsync(FlagQuery query)
    {
        var all = new List<FlagRecord>();
        var cursor = query.After;
        while (true)
        {
            var page = await Store.Flags.ListAsync(query with { After = cursor }, CancellationToken.None);
            Assert.True(page.Items.Count <= query.Limit);
            all.AddRange(page.Items);
            if (!page.HasMore)
            {
                return all;
            }

            cursor = page.Next;
        }
    }

    [StoreFact]
    public async Task ListingFiltersByStatus()
    {
        var baseline = await CreateBaselineAsync();
        var ids = await RaiseFlagsAsync(baseline.Id, 5);
        await Store.Flags.ReviewAsync(ids[1], FlagStatus.Confirmed, "saline drift", "analyst-3", CancellationToken.None);
        await Store.Flags.ReviewAsync(ids[3], FlagStatus.Dismissed, "sampling error", "analyst-3", CancellationToken.None);

        async Task<IEnumerable<string>> IdsOf(FlagStatusFilter status) =>
            (await Store.Flags.ListAsync(new FlagQuery(Status: status), CancellationToken.None)).Items.Select(f => f.Id);

        Assert.Equal([ids[0], ids[2], ids[4]], await IdsOf(FlagStatusFilter.Open));
        Assert.Equal([ids[1]], await IdsOf(FlagStatusFilter.Confirmed));
        Assert.Equal([ids[3]], await IdsOf(FlagStatusFilter.Dismissed));
        Assert.Equal(ids, await IdsOf(FlagStatusFilter.Any));
    }

    [StoreFact]
    public async Task ListingFiltersByBaseline()
    {
        var north = await CreateBaselineAsync("wells-north");
        var south = await CreateBaselineAsync("wells-south");
        var northIds = await RaiseFlagsAsync(north.Id, 2, "well-01");
        var southIds = await RaiseFlagsAsync(south.Id, 3, "well-09");
        await Store.Flags.ReviewAsync(southIds[0], FlagStatus.Confirmed, null, null, CancellationToken.None);

        var southOpen = await Store.Flags.ListAsync(new FlagQuery(BaselineId: south.Id), CancellationToken.None);
        var southAny = await Store.Flags.ListAsync(new FlagQuery(BaselineId: south.Id, Status: FlagStatusFilter.Any), CancellationToken.None);
        var northAny = await Store.Flags.ListAsync(new FlagQuery(BaselineId: north.Id, Status: FlagStatusFilter.Any), CancellationToken.None);
        var unknown = await Store.Flags.ListAsync(new FlagQuery(BaselineId: "no-such-baseline", Status: FlagStatusFilter.Any), CancellationToken.None);

        Assert.Equal(southIds[1..], southOpen.Items.Select(f => f.Id));
        Assert.Equal(southIds, southAny.Items.Select(f => f.Id));
        Assert.Equal(northIds, northAny.Items.Select(f => f.Id));
        Assert.Empty(unknown.Items);
    }

    [StoreFact]
    public async Task CursorPagingVisitsEveryFlagOnceInCommitOrder()
    {
        var baseline = await CreateBaselineAsync();
        var ids = await RaiseFlagsAsync(baseline.Id, 23);

        foreach (var limit in new[] { 1, 3, 7, 23, 500 })
        {
            var all = await ReadAllAsync(new FlagQuery(Status: FlagStatusFilter.Any, Limit: limit));
            Assert.Equal(ids, all.Select(f => f.Id));
            Assert.True(all.Zip(all.Skip(1)).All(p => p.First.Sequence < p.Second.Sequence));
        }
    }

    [StoreFact]
    public async Task PageSaysWhetherMoreFollowAndWhereToResume()
    {
        var baseline = await CreateBaselineAsync();
        var ids = await RaiseFlagsAsync(baseline.Id, 4);

        var first = await Store.Flags.ListAsync(new FlagQuery(Limit: 2), CancellationToken.None);
        var second = await Store.Flags.ListAsync(new FlagQuery(After: first.Next, Limit: 2), CancellationToken.None);
        var empty = await Store.Flags.ListAsync(new FlagQuery(After: second.Next, Limit: 2), CancellationToken.None);
        var none = await Store.Flags.ListAsync(new FlagQuery(BaselineId: "no-such-baseline"), CancellationToken.None);

        Assert.True(first.HasMore);
        Assert.Equal(ids[..2], first.Items.Select(f => f.Id));
        Assert.Equal(new FlagCursor(first.Items[^1].Sequence), first.Next);
        Assert.False(second.HasMore);
        Assert.Equal(ids[2..], second.Items.Select(f => f.Id));
        Assert.Empty(empty.Items);
        Assert.False(empty.HasMore);
        Assert.Equal(second.Next, empty.Next);
        Assert.Null(none.Next);
    }

    [StoreFact]
    public async Task FollowingTheCursorWhileTwoReplicasWriteMissesAndRepeatsNoFlag()
    {
        var baseline = await CreateBaselineAsync();
        var replicas = new[] { Open(), Open() };
        var writers = replicas.Select((replica, r) => Task.Run(() => RaiseFlagsAsync(baseline.Id, 15, $"well-{r}", replica))).ToArray();

        // A reader follows the cursor while the writers commit, as a long-polling dashboard would.
        var seen = new List<FlagRecord>();
        FlagCursor? cursor = null;
        async Task ReadOnAsync()
        {
            var page = await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any, After: cursor, Limit: 4), CancellationToken.None);
            seen.AddRange(page.Items);
            cursor = page.Next;
        }

        while (!writers.All(w => w.IsCompleted))
        {
            await ReadOnAsync();
        }

        var written = (await Task.WhenAll(writers)).SelectMany(ids => ids).ToHashSet();
        for (var i = 0; i < 10; i++)
        {
            await ReadOnAsync();
        }

        Assert.Equal(seen.Count, seen.Select(f => f.Id).Distinct().Count());
        Assert.Equal(written, seen.Select(f => f.Id).ToHashSet());
    }

    [StoreFact]
    public async Task LimitOutsideOneToFiveHundredIsRefused()
    {
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => Store.Flags.ListAsync(new FlagQuery(Limit: 0), CancellationToken.None));
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => Store.Flags.ListAsync(new FlagQuery(Limit: 501), CancellationToken.None));
        Assert.Empty((await Store.Flags.ListAsync(new FlagQuery(Limit: 500), CancellationToken.None)).Items);
        Assert.Empty((await Store.Flags.ListAsync(new FlagQuery(Limit: 1), CancellationToken.None)).Items);
    }

    [StoreFact]
    public async Task ReviewSetsTheStatusNoteReviewerAndTimeAndCanBeRevised()
    {
        var baseline = await CreateBaselineAsync();
        var id = (await RaiseFlagsAsync(baseline.Id, 1))[0];
        var raised = (await Store.Flags.GetAsync(id, CancellationToken.None))!;
        var expectedTime = Clock.Peek();

        var confirmed = await Store.Flags.ReviewAsync(id, FlagStatus.Confirmed, "Na/Cl towards the saline end member", "analyst-3", CancellationToken.None);
        var dismissed = await Store.Flags.ReviewAsync(id, FlagStatus.Dismissed, "pump failure at sampling", "analyst-5", CancellationToken.None);
        var read = await Store.Flags.GetAsync(id, CancellationToken.None);

        var confirmedReview = new FlagReview(FlagStatus.Confirmed, "Na/Cl towards the saline end member", "analyst-3", expectedTime.AddTicks(-(expectedTime.Ticks % 10)));
        Assert.Equal(raised with { Status = FlagStatus.Confirmed, Review = confirmedReview }, confirmed);
        Assert.Equal(FlagStatus.Dismissed, dismissed!.Status);
        Assert.Equal(new FlagReview(FlagStatus.Dismissed, "pump failure at sampling", "analyst-5", dismissed.Review!.ReviewedAt), dismissed.Review);
        Assert.True(dismissed.Review.ReviewedAt > confirmedReview.ReviewedAt);
        Assert.Equal(dismissed, read);
    }

    [StoreFact]
    public async Task ReviewOfAnUnknownFlagFindsNothingAndLeavesTheTokenAlone()
    {
        var before = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);

        Assert.Null(await Store.Flags.ReviewAsync("no-such-flag", FlagStatus.Confirmed, null, null, CancellationToken.None));
        Assert.Equal(before, await Store.Flags.GetChangeTokenAsync(CancellationToken.None));
    }

    [StoreFact]
    public async Task ReviewBackToOpenIsRefused()
    {
        var baseline = await CreateBaselineAsync();
        var id = (await RaiseFlagsAsync(baseline.Id, 1))[0];

        await Assert.ThrowsAsync<ArgumentException>(() => Store.Flags.ReviewAsync(id, FlagStatus.Open, null, null, CancellationToken.None));
    }

    [StoreFact]
    public async Task ChangeTokenMovesOnANewFlagAndOnAReviewAndOnNothingElse()
    {
        var tokens = new List<ChangeToken> { await Store.Flags.GetChangeTokenAsync(CancellationToken.None) };
        async Task<ChangeToken> Now() => await Store.Flags.GetChangeTokenAsync(CancellationToken.None);

        var baseline = await CreateBaselineAsync();
        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-01/2026-03-01"), CancellationToken.None);
        tokens.Add(await Now());
        var flagged = await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-02/2026-03-01", flagged: true), CancellationToken.None);
        tokens.Add(await Now());
        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-02/2026-03-01", flagged: true), CancellationToken.None);
        tokens.Add(await Now());
        await Store.Flags.ReviewAsync(flagged.Outcomes[0].Stored!.FlagId!, FlagStatus.Confirmed, null, "analyst-3", CancellationToken.None);
        tokens.Add(await Now());
        await Store.Baselines.RetireAsync(baseline.Id, CancellationToken.None);
        tokens.Add(await Now());

        // start, unflagged screening (same), flag (new), duplicate (same), review (new), retirement (same)
        Assert.Equal(tokens[0], tokens[1]);
        Assert.NotEqual(tokens[1], tokens[2]);
        Assert.Equal(tokens[2], tokens[3]);
        Assert.NotEqual(tokens[3], tokens[4]);
        Assert.Equal(tokens[4], tokens[5]);
        Assert.Equal(3, tokens.Distinct().Count());
        Assert.Matches("^[0-9a-f]{32}-[0-9]+$", tokens[4].ToString());
        Assert.Equal(tokens[4], (await Store.Flags.ListAsync(new FlagQuery(), CancellationToken.None)).Token);
    }

    [StoreFact]
    public async Task WaitForChangeWakesSoonAfterAnotherReplicaCommitsAFlag()
    {
        var baseline = await CreateBaselineAsync();
        await using var other = new PartwiseStorage(Options, Clock);
        var since = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);

        var waiting = Store.Flags.WaitForChangeAsync(since, TimeSpan.FromSeconds(20), CancellationToken.None);
        await Task.Delay(300);
        Assert.False(waiting.IsCompleted);
        await other.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02", flagged: true), CancellationToken.None);
        var clock = Stopwatch.StartNew();
        var woken = await waiting;
        clock.Stop();

        Assert.NotEqual(since, woken);
        Assert.Equal(await other.Flags.GetChangeTokenAsync(CancellationToken.None), woken);
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(1), $"woke {clock.Elapsed.TotalMilliseconds:F0} ms after the commit");
    }

    [StoreFact]
    public async Task WaitForChangeWakesAtOnceForAReviewThroughTheSameStore()
    {
        var baseline = await CreateBaselineAsync();
        var id = (await RaiseFlagsAsync(baseline.Id, 1))[0];
        var since = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);

        var waiting = Store.Flags.WaitForChangeAsync(since, TimeSpan.FromSeconds(20), CancellationToken.None);
        await Store.Flags.ReviewAsync(id, FlagStatus.Dismissed, null, null, CancellationToken.None);
        var clock = Stopwatch.StartNew();
        var woken = await waiting;

        Assert.True(woken.Counter > since.Counter);
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(1), $"woke {clock.Elapsed.TotalMilliseconds:F0} ms after the commit");
    }

    [StoreFact]
    public async Task WaitForChangeTimesOutWithTheSameTokenWhenNothingChanges()
    {
        var baseline = await CreateBaselineAsync();
        var since = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        var clock = Stopwatch.StartNew();

        // An unflagged screening is no change of the flags.
        var waiting = Store.Flags.WaitForChangeAsync(since, TimeSpan.FromMilliseconds(700), CancellationToken.None);
        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02"), CancellationToken.None);

        Assert.Equal(since, await waiting);
        Assert.True(clock.Elapsed >= TimeSpan.FromMilliseconds(650), $"returned after {clock.Elapsed.TotalMilliseconds:F0} ms");
    }

    [StoreFact]
    public async Task WaitForChangeReturnsAtOnceWhenTheTokenIsAlreadyOld()
    {
        var baseline = await CreateBaselineAsync();
        var old = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        await RaiseFlagsAsync(baseline.Id, 1);

        var clock = Stopwatch.StartNew();
        var current = await Store.Flags.WaitForChangeAsync(old, TimeSpan.FromSeconds(20), CancellationToken.None);

        Assert.NotEqual(old, current);
        // "At once": one read of the token, far below the 20 s the caller was willing to wait.
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(5), $"returned after {clock.Elapsed.TotalMilliseconds:F0} ms");
    }

    [StoreFact]
    public async Task WaitForChangeStopsWhenCancelledAndRefusesANegativeTimeout()
    {
        var since = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        using var cancel = new CancellationTokenSource(TimeSpan.FromMilliseconds(300));

        await Assert.ThrowsAnyAsync<OperationCanceledException>(() => Store.Flags.WaitForChangeAsync(since, TimeSpan.FromSeconds(20), cancel.Token));
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => Store.Flags.WaitForChangeAsync(since, TimeSpan.FromSeconds(-1), CancellationToken.None));
    }

    [StoreFact]
    public async Task ManyWaitersAllWakeForOneChange()
    {
        var baseline = await CreateBaselineAsync();
        await using var other = new PartwiseStorage(Options, Clock);
        var since = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);

        var waiting = Enumerable.Range(0, 40).Select(_ => Store.Flags.WaitForChangeAsync(since, TimeSpan.FromSeconds(20), CancellationToken.None)).ToArray();
        await other.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02", flagged: true), CancellationToken.None);
        var woken = await Task.WhenAll(waiting).WaitAsync(TimeSpan.FromSeconds(5));

        Assert.All(woken, t => Assert.True(t.Counter > since.Counter));
    }

    [StoreFact]
    public async Task ReviewsAndNewFlagsFromTwoReplicasAtOnceAllCommitAndEachMovesTheCounter()
    {
        var baseline = await CreateBaselineAsync();
        var existing = await RaiseFlagsAsync(baseline.Id, 10, "well-01");
        var before = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        var replicas = new[] { Open(), Open() };

        var reviews = existing.Select((id, i) => Task.Run(() =>
            replicas[i % 2].Flags.ReviewAsync(id, i % 3 == 0 ? FlagStatus.Dismissed : FlagStatus.Confirmed, "checked", "analyst-3", CancellationToken.None)));
        var screenings = Enumerable.Range(0, 10).Select(i => Task.Run(() =>
            replicas[(i + 1) % 2].Screenings.RecordAsync(baseline.Id, Samples.Entry(string.Create(CultureInfo.InvariantCulture, $"well-02/{i:000}"), flagged: true), CancellationToken.None)));
        var reviewed = await Task.WhenAll(reviews);
        var recorded = await Task.WhenAll(screenings);

        Assert.All(reviewed, Assert.NotNull);
        Assert.All(recorded, r => Assert.Equal(ScreeningBatchStatus.Committed, r.Status));
        var after = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        Assert.Equal(before.Counter + 20, after.Counter);
        var open = await Store.Flags.ListAsync(new FlagQuery(Limit: 500), CancellationToken.None);
        Assert.Equal(10, open.Items.Count);
        Assert.All(open.Items, f => Assert.StartsWith("well-02/", f.SampleId, StringComparison.Ordinal));
    }
}
