using Partwise.Storage.Flags;
using Partwise.Storage.Screenings;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

public abstract partial class StoreBehaviour
{
    [StoreFact]
    public async Task MigratingAgainChangesNothing()
    {
        var baseline = await CreateBaselineAsync();

        var again = await Store.MigrateAsync(CancellationToken.None);
        var third = await Open().MigrateAsync(CancellationToken.None);

        Assert.Equal(Store.SchemaVersion, again);
        Assert.Equal(Store.SchemaVersion, third);
        Assert.Equal(baseline, await Store.Baselines.GetAsync(baseline.Id, CancellationToken.None));
        await Store.PingAsync(CancellationToken.None);
    }

    [StoreFact]
    public async Task ReplicasMigratingAnEmptyDatabaseTogetherBothSucceed()
    {
        var options = await FreshDatabaseAsync();
        var replicas = Enumerable.Range(0, 3).Select(_ => Open(options)).ToArray();

        var versions = await Task.WhenAll(replicas.Select(r => Task.Run(() => r.MigrateAsync(CancellationToken.None))));

        Assert.All(versions, v => Assert.Equal(Store.SchemaVersion, v));
        var created = await replicas[0].Baselines.CreateAsync("wells-north", Samples.Document, CancellationToken.None);
        Assert.Equal(1, created.Version);
    }

    [StoreFact]
    public async Task PingSucceedsOnlyOnceTheSchemaIsMigrated()
    {
        var fresh = Open(await FreshDatabaseAsync());

        await Assert.ThrowsAsync<StorageUnavailableException>(() => fresh.PingAsync(CancellationToken.None));
        await fresh.MigrateAsync(CancellationToken.None);
        await fresh.PingAsync(CancellationToken.None);
    }

    [StoreFact]
    public async Task EverythingStoredSurvivesReopeningTheStore()
    {
        var baseline = await CreateBaselineAsync();
        await Store.Baselines.RetireAsync((await CreateBaselineAsync("wells-south")).Id, CancellationToken.None);
        var recorded = await Store.Screenings.RecordBatchAsync(baseline.Id, [
            Samples.Entry("well-01/2026-03-01", flagged: true),
            Samples.Entry("well-02/2026-03-01"),
        ], CancellationToken.None);
        var flagId = recorded.Outcomes[0].Stored!.FlagId!;
        var reviewed = await Store.Flags.ReviewAsync(flagId, FlagStatus.Confirmed, "saline drift", "analyst-3", CancellationToken.None);
        var baselines = await Store.Baselines.ListAsync(activeOnly: false, CancellationToken.None);
        var token = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        await Store.DisposeAsync();

        var reopened = Open();
        await reopened.MigrateAsync(CancellationToken.None);

        Assert.Equal(baselines, await reopened.Baselines.ListAsync(activeOnly: false, CancellationToken.None));
        Assert.Equal(recorded.Outcomes[0].Stored, await reopened.Screenings.GetAsync(baseline.Id, "well-01/2026-03-01", CancellationToken.None));
        Assert.Equal(recorded.Outcomes[1].Stored, await reopened.Screenings.GetAsync(baseline.Id, "well-02/2026-03-01", CancellationToken.None));
        Assert.Equal(reviewed, await reopened.Flags.GetAsync(flagId, CancellationToken.None));
        Assert.Equal(token, await reopened.Flags.GetChangeTokenAsync(CancellationToken.None));
        var duplicate = await reopened.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-02/2026-03-01"), CancellationToken.None);
        Assert.Equal(ScreeningOutcomeKind.Duplicate, duplicate.Outcomes[0].Kind);
        Assert.Equal(2, (await reopened.Baselines.CreateAsync("wells-north", Samples.Document, CancellationToken.None)).Version);
    }

    [StoreFact]
    public async Task EachDatabaseHasItsOwnEpochSoTokensNeverRepeatAcrossThem()
    {
        var other = Open(await FreshDatabaseAsync());
        await other.MigrateAsync(CancellationToken.None);

        var mine = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);
        var theirs = await other.Flags.GetChangeTokenAsync(CancellationToken.None);

        Assert.Equal(0, mine.Counter);
        Assert.Equal(0, theirs.Counter);
        Assert.NotEqual(mine.Epoch, theirs.Epoch);
    }
}
