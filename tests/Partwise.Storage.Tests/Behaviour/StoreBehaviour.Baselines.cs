using Partwise.Storage.Baselines;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

public abstract partial class StoreBehaviour
{
    [StoreFact]
    public async Task FirstBaselineUnderANameIsVersionOneAndEachRefitTheNext()
    {
        var first = await CreateBaselineAsync("wells-north");
        var second = await CreateBaselineAsync("wells-north");
        var third = await CreateBaselineAsync("wells-north");

        Assert.Equal([1, 2, 3], new[] { first.Version, second.Version, third.Version });
        Assert.Equal(3, new[] { first.Id, second.Id, third.Id }.Distinct().Count());
    }

    [StoreFact]
    public async Task VersionsCountSeparatelyPerName()
    {
        await CreateBaselineAsync("wells-north");
        await CreateBaselineAsync("wells-north");
        var south = await CreateBaselineAsync("wells-south");
        var northAgain = await CreateBaselineAsync("wells-north");

        Assert.Equal(1, south.Version);
        Assert.Equal(3, northAgain.Version);
    }

    [StoreFact]
    public async Task ConcurrentCreationsUnderOneNameFromTwoReplicasGetDistinctConsecutiveVersions()
    {
        var replicas = new[] { Store, Open() };
        var created = await Task.WhenAll(Enumerable.Range(0, 12).Select(i =>
            Task.Run(() => replicas[i % 2].Baselines.CreateAsync("wells-east", Samples.Document, CancellationToken.None))));

        Assert.Equal(Enumerable.Range(1, 12), created.Select(b => b.Version).Order());
    }

    [StoreFact]
    public async Task CreatedBaselineReadsBackWithTheDocumentRenderedFromItsStamp()
    {
        var expectedTime = Clock.Peek();
        BaselineStamp? seen = null;
        var created = await Store.Baselines.CreateAsync("wells-north", stamp =>
        {
            seen = stamp;
            return Samples.Document(stamp);
        }, CancellationToken.None);

        var read = await Store.Baselines.GetAsync(created.Id, CancellationToken.None);

        Assert.NotNull(seen);
        Assert.Equal(new BaselineStamp(created.Id, "wells-north", 1, created.CreatedAt), seen);
        Assert.Equal(created, read);
        Assert.Equal(Samples.Document(seen), read!.DocumentJson);
        Assert.False(read.IsRetired);
        // The store cuts its clock to whole microseconds, what both providers keep.
        Assert.Equal(expectedTime.AddTicks(-(expectedTime.Ticks % 10)), read.CreatedAt);
        Assert.Equal(TimeSpan.Zero, read.CreatedAt.Offset);
    }

    [StoreFact]
    public async Task UnknownBaselineReadsAsNull()
    {
        await CreateBaselineAsync();

        Assert.Null(await Store.Baselines.GetAsync("0000000000000000", CancellationToken.None));
    }

    [StoreFact]
    public async Task AFailedRenderStoresNothingAndUsesUpNoVersion()
    {
        await Assert.ThrowsAsync<InvalidOperationException>(() =>
            Store.Baselines.CreateAsync("wells-north", _ => throw new InvalidOperationException("render failed"), CancellationToken.None));
        await Assert.ThrowsAsync<ArgumentException>(() =>
            Store.Baselines.CreateAsync("wells-north", _ => " ", CancellationToken.None));

        Assert.Empty(await Store.Baselines.ListAsync(activeOnly: false, CancellationToken.None));
        Assert.Equal(1, (await CreateBaselineAsync("wells-north")).Version);
    }

    [StoreFact]
    public async Task BlankNameIsRefused()
    {
        await Assert.ThrowsAsync<ArgumentException>(() => Store.Baselines.CreateAsync(" ", Samples.Document, CancellationToken.None));
    }

    [StoreFact]
    public async Task ListingPutsTheLatestFirstAndCanLeaveOutRetiredOnes()
    {
        var a = await CreateBaselineAsync("wells-north");
        var b = await CreateBaselineAsync("wells-south");
        var c = await CreateBaselineAsync("wells-north");
        await Store.Baselines.RetireAsync(b.Id, CancellationToken.None);

        var all = await Store.Baselines.ListAsync(activeOnly: false, CancellationToken.None);
        var active = await Store.Baselines.ListAsync(activeOnly: true, CancellationToken.None);

        Assert.Equal([c.Id, b.Id, a.Id], all.Select(x => x.Id));
        Assert.True(all[1].IsRetired);
        Assert.Equal([c.Id, a.Id], active.Select(x => x.Id));
    }

    [StoreFact]
    public async Task RetiringIsIdempotentKeepsTheFirstTimeAndSaysWhetherTheBaselineExists()
    {
        var baseline = await CreateBaselineAsync();

        Assert.True(await Store.Baselines.RetireAsync(baseline.Id, CancellationToken.None));
        var first = (await Store.Baselines.GetAsync(baseline.Id, CancellationToken.None))!.RetiredAt;
        Assert.True(await Store.Baselines.RetireAsync(baseline.Id, CancellationToken.None));
        var again = await Store.Baselines.GetAsync(baseline.Id, CancellationToken.None);
        Assert.False(await Store.Baselines.RetireAsync("no-such-baseline", CancellationToken.None));

        Assert.NotNull(first);
        Assert.True(again!.IsRetired);
        Assert.Equal(first, again.RetiredAt);
        Assert.Equal(baseline.DocumentJson, again.DocumentJson);
    }
}
