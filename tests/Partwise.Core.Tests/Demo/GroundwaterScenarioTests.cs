using Partwise.Demo;

namespace Partwise.Core.Tests.Demo;

public class GroundwaterScenarioTests
{
    private static readonly int[] Seeds = [GroundwaterScenario.DemoSeed, 1, 7, 2026, 123456];

    [Fact]
    public void TheSameSeedGivesIdenticalSamples()
    {
        var a = GroundwaterScenario.Create(99);
        var b = GroundwaterScenario.Create(99);
        Assert.Equal(a.Samples.Count, b.Samples.Count);
        for (var i = 0; i < a.Samples.Count; i++)
        {
            Assert.Equal(a.Samples[i].Id, b.Samples[i].Id);
            Assert.Equal(a.Samples[i].ObservedAt, b.Samples[i].ObservedAt);
            Assert.Equal(a.Samples[i].Values, b.Samples[i].Values);
        }
    }

    [Fact]
    public void DifferentSeedsGiveDifferentValuesOnTheSameSchedule()
    {
        var a = GroundwaterScenario.Create(1);
        var b = GroundwaterScenario.Create(2);
        Assert.Equal(a.Samples.Select(s => s.Id), b.Samples.Select(s => s.Id));
        Assert.Contains(Enumerable.Range(0, a.Samples.Count), i => !a.Samples[i].Values.SequenceEqual(b.Samples[i].Values));
    }

    [Fact]
    public void SamplesFollowEachWellsScheduleWithUniqueIds()
    {
        var scenario = GroundwaterScenario.Create(GroundwaterScenario.DemoSeed);
        Assert.Equal(scenario.Samples.Count, scenario.Samples.Select(s => s.Id).Distinct(StringComparer.Ordinal).Count());
        Assert.All(scenario.Baseline, s => Assert.Equal(2025, s.ObservedAt.Year));
        Assert.All(scenario.Later, s => Assert.True(s.ObservedAt.Year == 2026 && s.ObservedAt.Month <= 6, s.Id));
        foreach (var well in GroundwaterScenario.Wells)
        {
            var expected = well.Cadence == SamplingCadence.Weekly ? 52 : 12;
            Assert.Equal(expected, scenario.OfWell(well.Id, MonitoringPeriod.Baseline).Count);
            Assert.All(scenario.OfWell(well.Id, MonitoringPeriod.Baseline), s => Assert.StartsWith(well.Id + "/2025-", s.Id, StringComparison.Ordinal));
        }
    }

    [Fact]
    public void AFewValuesBelowDetectionAreReportedAsZeroMostlyNitrateAndPotassium()
    {
        var no3 = GroundwaterScenario.IndexOf("NO3");
        var k = GroundwaterScenario.IndexOf("K");
        foreach (var seed in Seeds)
        {
            var scenario = GroundwaterScenario.Create(seed);
            var zeros = scenario.Samples.SelectMany(s => s.Values.Select((v, j) => (v, j))).Where(t => t.v == 0).ToArray();
            var cells = scenario.Samples.Count * GroundwaterScenario.Parts.Count;
            Assert.InRange(zeros.Length, 2, cells / 50);
            Assert.True(zeros.Count(t => t.j == no3 || t.j == k) >= 0.8 * zeros.Length, $"seed {seed}: zeros outside NO3 and K");
        }
    }

    [Fact]
    public void ReportedValuesAreAtOrAboveTheirDetectionLimitAndHaveTwoDecimals()
    {
        var scenario = GroundwaterScenario.Create(GroundwaterScenario.DemoSeed);
        foreach (var s in scenario.Samples)
        {
            for (var j = 0; j < GroundwaterScenario.Parts.Count; j++)
            {
                var v = s.Values[j];
                Assert.True(v == 0 || v >= GroundwaterScenario.DetectionLimits[GroundwaterScenario.Parts[j]], $"{s.Id} {GroundwaterScenario.Parts[j]} = {v}");
                Assert.Equal(Math.Round(v, 2), v);
            }
        }
    }

    [Fact]
    public void DriftRaisesSodiumToCalciumAndChlorideToBicarbonateInTheDriftingWellOnly()
    {
        foreach (var seed in Seeds)
        {
            var scenario = GroundwaterScenario.Create(seed);
            foreach (var (num, den) in new[] { ("Na", "Ca"), ("Cl", "HCO3") })
            {
                double LogRatio(WaterSample s) => Math.Log(s.ValueOf(num) / s.ValueOf(den));
                var (mean, sd) = MeanAndSd(scenario.OfWell(GroundwaterScenario.DriftingWell, MonitoringPeriod.Baseline).Select(LogRatio));
                var late = scenario.OfWell(GroundwaterScenario.DriftingWell, MonitoringPeriod.Later).TakeLast(6).Select(LogRatio).Average();
                Assert.True(late > mean + (4 * sd), $"seed {seed}: ln({num}/{den}) late {late} vs baseline {mean} ± {sd}");

                // A stable well keeps its ratio: its later mean stays within its own baseline spread.
                var (stableMean, stableSd) = MeanAndSd(scenario.OfWell("well-07", MonitoringPeriod.Baseline).Select(LogRatio));
                var stableLater = scenario.OfWell("well-07", MonitoringPeriod.Later).Select(LogRatio).Average();
                Assert.InRange(stableLater, stableMean - (3 * stableSd), stableMean + (3 * stableSd));
            }
        }
    }

    [Fact]
    public void DriftStartsAtZeroBrineAndRisesMonotonically()
    {
        var drift = GroundwaterScenario.Create(GroundwaterScenario.DemoSeed).OfWell(GroundwaterScenario.DriftingWell, MonitoringPeriod.Later);
        Assert.True(drift[0].BrineFraction < 0.001);
        Assert.True(drift.Zip(drift.Skip(1)).All(p => p.Second.BrineFraction > p.First.BrineFraction));
        Assert.InRange(drift[^1].BrineFraction, 0.9 * GroundwaterScenario.MaxBrineFraction, GroundwaterScenario.MaxBrineFraction);
    }

    [Fact]
    public void CalciumFollowsBicarbonateAndSodiumFollowsChlorideWithinAWell()
    {
        // The model's log-scale correlations are about 0.8 (Ca–HCO3) and 0.85 (Na–Cl); 52 weekly samples
        // estimate them well enough to stay above 0.5 and above the unlinked pair Ca–Cl.
        var samples = GroundwaterScenario.Create(GroundwaterScenario.DemoSeed).OfWell("well-03", MonitoringPeriod.Baseline);
        double Corr(string a, string b) => Correlation(samples.Select(s => Math.Log(s.ValueOf(a))).ToArray(), samples.Select(s => Math.Log(s.ValueOf(b))).ToArray());
        Assert.True(Corr("Ca", "HCO3") > 0.5);
        Assert.True(Corr("Na", "Cl") > 0.5);
        Assert.True(Corr("Ca", "HCO3") > Corr("Ca", "Cl"));
    }

    private static (double Mean, double Sd) MeanAndSd(IEnumerable<double> values)
    {
        var x = values.ToArray();
        var mean = x.Average();
        return (mean, Math.Sqrt(x.Sum(v => (v - mean) * (v - mean)) / (x.Length - 1)));
    }

    private static double Correlation(double[] x, double[] y)
    {
        var mx = x.Average();
        var my = y.Average();
        var sxy = x.Zip(y).Sum(p => (p.First - mx) * (p.Second - my));
        return sxy / Math.Sqrt(x.Sum(v => (v - mx) * (v - mx)) * y.Sum(v => (v - my) * (v - my)));
    }
}
