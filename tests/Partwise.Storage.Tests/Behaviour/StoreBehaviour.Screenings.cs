using System.Globalization;
using Partwise.Storage.Flags;
using Partwise.Storage.Screenings;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

public abstract partial class StoreBehaviour
{
    [StoreFact]
    public async Task NewSampleIsRecordedAndReadsBackAsStored()
    {
        var baseline = await CreateBaselineAsync();
        var entry = Samples.Entry("well-07/2026-03-02");

        var result = await Store.Screenings.RecordAsync(baseline.Id, entry, CancellationToken.None);
        var stored = await Store.Screenings.GetAsync(baseline.Id, entry.SampleId, CancellationToken.None);

        Assert.Equal(ScreeningBatchStatus.Committed, result.Status);
        var outcome = Assert.Single(result.Outcomes);
        Assert.Equal(ScreeningOutcomeKind.Recorded, outcome.Kind);
        Assert.Equal(outcome.Stored, stored);
        Assert.Equal(entry.ResultJson, stored!.ResultJson);
        Assert.Equal(entry.Fingerprint, stored.Fingerprint);
        Assert.Equal(entry.ObservedAt, stored.ObservedAt);
        Assert.Equal(TimeSpan.FromHours(1), stored.ObservedAt!.Value.Offset);
        Assert.Equal("well-07", stored.Source);
        Assert.Null(stored.FlagId);
    }

    [StoreFact]
    public async Task SameSampleWithTheSameValuesIsADuplicateReturningTheStoredResult()
    {
        var baseline = await CreateBaselineAsync();
        var first = await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02", flagged: true), CancellationToken.None);

        // Posted again, even with a result that would now read differently: the stored one comes back.
        var again = Samples.Entry("well-07/2026-03-02", flagged: true) with { ResultJson = """{"recomputed":true}""" };
        var second = await Store.Screenings.RecordAsync(baseline.Id, again, CancellationToken.None);

        Assert.Equal(ScreeningBatchStatus.Committed, second.Status);
        var outcome = Assert.Single(second.Outcomes);
        Assert.Equal(ScreeningOutcomeKind.Duplicate, outcome.Kind);
        Assert.Equal(first.Outcomes[0].Stored, outcome.Stored);
        var flags = await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any), CancellationToken.None);
        Assert.Equal(outcome.Stored!.FlagId, Assert.Single(flags.Items).Id);
    }

    [StoreFact]
    public async Task SameSampleIdWithOtherValuesIsAConflictAndChangesNothing()
    {
        var baseline = await CreateBaselineAsync();
        var original = Samples.Entry("well-07/2026-03-02");
        await Store.Screenings.RecordAsync(baseline.Id, original, CancellationToken.None);

        var result = await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02", sodium: 12.5, flagged: true), CancellationToken.None);

        Assert.Equal(ScreeningBatchStatus.Conflict, result.Status);
        var outcome = Assert.Single(result.Outcomes);
        Assert.Equal(ScreeningOutcomeKind.Conflict, outcome.Kind);
        Assert.Null(outcome.Stored);
        Assert.Equal(original.ResultJson, (await Store.Screenings.GetAsync(baseline.Id, original.SampleId, CancellationToken.None))!.ResultJson);
        Assert.Empty((await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any), CancellationToken.None)).Items);
    }

    [StoreFact]
    public async Task TheSameSampleIdUnderAnotherBaselineIsAnotherScreening()
    {
        var north = await CreateBaselineAsync("wells-north");
        var south = await CreateBaselineAsync("wells-south");

        await Store.Screenings.RecordAsync(north.Id, Samples.Entry("well-07/2026-03-02"), CancellationToken.None);
        var other = await Store.Screenings.RecordAsync(south.Id, Samples.Entry("well-07/2026-03-02", sodium: 20), CancellationToken.None);

        Assert.Equal(ScreeningOutcomeKind.Recorded, Assert.Single(other.Outcomes).Kind);
    }

    [StoreFact]
    public async Task FlaggedScreeningInsertsAnOpenFlagWithItsDetails()
    {
        var baseline = await CreateBaselineAsync();
        var entry = Samples.Entry("well-07/2026-03-02", flagged: true);

        var result = await Store.Screenings.RecordAsync(baseline.Id, entry, CancellationToken.None);

        var stored = Assert.Single(result.Outcomes).Stored!;
        Assert.NotNull(stored.FlagId);
        var flag = await Store.Flags.GetAsync(stored.FlagId, CancellationToken.None);
        Assert.NotNull(flag);
        Assert.Equal(baseline.Id, flag.BaselineId);
        Assert.Equal(entry.SampleId, flag.SampleId);
        Assert.Equal(entry.ObservedAt, flag.ObservedAt);
        Assert.Equal(entry.Source, flag.Source);
        Assert.Equal(stored.ScreenedAt, flag.ScreenedAt);
        Assert.Equal(entry.Flag!.Distance, flag.Distance);
        Assert.Equal(entry.Flag.PValue, flag.PValue);
        Assert.Equal(entry.Flag.ReasonsJson, flag.ReasonsJson);
        Assert.Equal(entry.Flag.ValuesJson, flag.ValuesJson);
        Assert.Equal(FlagStatus.Open, flag.Status);
        Assert.Null(flag.Review);
    }

    [StoreFact]
    public async Task AFlagWithoutSampleValuesReadsBackWithNone()
    {
        var baseline = await CreateBaselineAsync();
        var entry = Samples.Entry("well-07/2026-03-03", flagged: true);
        entry = entry with { Flag = entry.Flag! with { ValuesJson = null } };

        var stored = Assert.Single((await Store.Screenings.RecordAsync(baseline.Id, entry, CancellationToken.None)).Outcomes).Stored!;

        var flag = await Store.Flags.GetAsync(stored.FlagId!, CancellationToken.None);
        Assert.NotNull(flag);
        Assert.Null(flag.ValuesJson);
        var reviewed = await Store.Flags.ReviewAsync(flag.Id, FlagStatus.Dismissed, "n", "r", CancellationToken.None);
        Assert.Null(reviewed!.ValuesJson);
    }

    [StoreFact]
    public async Task UnflaggedScreeningRaisesNoFlag()
    {
        var baseline = await CreateBaselineAsync();

        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02"), CancellationToken.None);

        Assert.Empty((await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any), CancellationToken.None)).Items);
    }

    [StoreFact]
    public async Task BatchRecordsNewSamplesAndMarksDuplicatesInTheOrderGiven()
    {
        var baseline = await CreateBaselineAsync();
        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-02/2026-03-01"), CancellationToken.None);

        var result = await Store.Screenings.RecordBatchAsync(baseline.Id, [
            Samples.Entry("well-01/2026-03-01", flagged: true),
            Samples.Entry("well-02/2026-03-01"),
            Samples.Entry("well-03/2026-03-01"),
            Samples.Entry("well-01/2026-03-01", flagged: true),
        ], CancellationToken.None);

        Assert.Equal(ScreeningBatchStatus.Committed, result.Status);
        Assert.Equal(
            [ScreeningOutcomeKind.Recorded, ScreeningOutcomeKind.Duplicate, ScreeningOutcomeKind.Recorded, ScreeningOutcomeKind.Duplicate],
            result.Outcomes.Select(o => o.Kind));
        Assert.Equal(["well-01/2026-03-01", "well-02/2026-03-01", "well-03/2026-03-01", "well-01/2026-03-01"], result.Outcomes.Select(o => o.SampleId));
        Assert.Equal(result.Outcomes[0].Stored, result.Outcomes[3].Stored);
        var flags = await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any), CancellationToken.None);
        Assert.Equal(result.Outcomes[0].Stored!.FlagId, Assert.Single(flags.Items).Id);
    }

    [StoreFact]
    public async Task BatchWithAConflictIsRolledBackEntirelyFlagsIncluded()
    {
        var baseline = await CreateBaselineAsync();
        await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-02/2026-03-01"), CancellationToken.None);
        var before = await Store.Flags.GetChangeTokenAsync(CancellationToken.None);

        var result = await Store.Screenings.RecordBatchAsync(baseline.Id, [
            Samples.Entry("well-01/2026-03-01", flagged: true),
            Samples.Entry("well-02/2026-03-01", sodium: 30, flagged: true),
            Samples.Entry("well-02/2026-03-01"),
            Samples.Entry("well-01/2026-03-01", flagged: true),
        ], CancellationToken.None);

        Assert.Equal(ScreeningBatchStatus.Conflict, result.Status);
        Assert.Equal(
            [ScreeningOutcomeKind.NotRecorded, ScreeningOutcomeKind.Conflict, ScreeningOutcomeKind.Duplicate, ScreeningOutcomeKind.NotRecorded],
            result.Outcomes.Select(o => o.Kind));
        Assert.Null(await Store.Screenings.GetAsync(baseline.Id, "well-01/2026-03-01", CancellationToken.None));
        Assert.Empty((await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any), CancellationToken.None)).Items);
        Assert.Equal(before, await Store.Flags.GetChangeTokenAsync(CancellationToken.None));
    }

    [StoreFact]
    public async Task ScreeningAnUnknownOrRetiredBaselineStoresNothing()
    {
        var baseline = await CreateBaselineAsync();
        await Store.Baselines.RetireAsync(baseline.Id, CancellationToken.None);

        var retired = await Store.Screenings.RecordAsync(baseline.Id, Samples.Entry("well-07/2026-03-02", flagged: true), CancellationToken.None);
        var unknown = await Store.Screenings.RecordAsync("no-such-baseline", Samples.Entry("well-07/2026-03-02"), CancellationToken.None);

        Assert.Equal(ScreeningBatchStatus.BaselineRetired, retired.Status);
        Assert.Empty(retired.Outcomes);
        Assert.Equal(ScreeningBatchStatus.BaselineNotFound, unknown.Status);
        Assert.Null(await Store.Screenings.GetAsync(baseline.Id, "well-07/2026-03-02", CancellationToken.None));
        Assert.Empty((await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any), CancellationToken.None)).Items);
    }

    [StoreFact]
    public async Task MalformedEntriesAreRefusedAndNothingOfTheirBatchIsStored()
    {
        var baseline = await CreateBaselineAsync();
        var good = Samples.Entry("well-01/2026-03-01");
        var flagged = Samples.Entry("well-02/2026-03-01", flagged: true);
        ScreeningEntry[] bad =
        [
            good with { SampleId = " " },
            good with { Fingerprint = "" },
            good with { ResultJson = "" },
            flagged with { Flag = flagged.Flag! with { Distance = double.NaN } },
            flagged with { Flag = flagged.Flag! with { Distance = -1 } },
            flagged with { Flag = flagged.Flag! with { PValue = 1.5 } },
            flagged with { Flag = flagged.Flag! with { ReasonsJson = "" } },
        ];

        await Assert.ThrowsAsync<ArgumentException>(() => Store.Screenings.RecordBatchAsync(baseline.Id, [], CancellationToken.None));
        foreach (var entry in bad)
        {
            await Assert.ThrowsAsync<ArgumentException>(() => Store.Screenings.RecordBatchAsync(baseline.Id, [good, entry], CancellationToken.None));
        }

        Assert.Null(await Store.Screenings.GetAsync(baseline.Id, good.SampleId, CancellationToken.None));
    }

    [StoreFact]
    public async Task OverlappingBatchesFromTwoReplicasNeitherDeadlockNorRecordASampleTwice()
    {
        var baseline = await CreateBaselineAsync();
        var replicas = new[] { Open(), Open() };
        // Each round: one replica posts the samples in order, the other in reverse (a client retrying through
        // another replica with its list the other way round); every other sample is flagged.
        for (var round = 0; round < 4; round++)
        {
            var forward = Enumerable.Range(0, 12)
                .Select(i => Samples.Entry(string.Create(CultureInfo.InvariantCulture, $"round-{round}/well-{i:00}"), flagged: i % 2 == 0))
                .ToList();
            var backward = Enumerable.Reverse(forward).ToList();

            var results = await Task.WhenAll(
                Task.Run(() => replicas[0].Screenings.RecordBatchAsync(baseline.Id, forward, CancellationToken.None)),
                Task.Run(() => replicas[1].Screenings.RecordBatchAsync(baseline.Id, backward, CancellationToken.None)));

            Assert.All(results, r => Assert.Equal(ScreeningBatchStatus.Committed, r.Status));
            var recorded = results.SelectMany(r => r.Outcomes).Where(o => o.Kind == ScreeningOutcomeKind.Recorded).Select(o => o.SampleId).ToList();
            Assert.Equal(forward.Select(e => e.SampleId).Order(), recorded.Order());
            Assert.Equal(forward.Select(e => e.SampleId), results[0].Outcomes.Select(o => o.SampleId));
            Assert.Equal(backward.Select(e => e.SampleId), results[1].Outcomes.Select(o => o.SampleId));
        }

        var flags = await Store.Flags.ListAsync(new FlagQuery(Status: FlagStatusFilter.Any, Limit: 500), CancellationToken.None);
        Assert.Equal(4 * 6, flags.Items.Count);
    }
}
