using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Screening;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

public class ScreenerTests
{
    private const int J = 8;

    private static readonly CompositionTable Reference = MonitoringData.Reference(seed: 81, n: 400, outlierShare: 0.05);

    private static Baseline Fit(ScatterMethod method, double[]? map = null, BaselineOptions? options = null, CompositionTable? reference = null)
    {
        reference ??= Reference;
        map ??= CoordinateMaps.Pivot(J);
        return BaselineFit.Fit(reference.Parts, map, CoordinateMaps.Apply(reference, map), (options ?? new BaselineOptions()) with { Scatter = method }, reference).Baseline;
    }

    private static Dictionary<string, double> Scaled(Baseline baseline, params (string Ion, double Factor)[] changes)
    {
        // The baseline's centre composition exp(μ_clr), with some parts scaled.
        var sample = baseline.Parts.Select((ion, k) => (ion, value: Math.Exp(baseline.ClrLocation[k]))).ToDictionary(t => t.ion, t => t.value);
        foreach (var (ion, factor) in changes)
        {
            sample[ion] *= factor;
        }

        return sample;
    }

    [NeedsPythonFact]
    public void PValueIsTheChiSquareUpperTailOfTheSquaredDistance()
    {
        // p = 1 − F_χ²(d²; p), against scipy.stats.chi2.sf, also for samples far out.
        var baseline = Fit(ScatterMethod.Robust);
        var fresh = MonitoringData.Reference(seed: 82, n: 40, outlierShare: 0.5, shift: 3);
        var results = Screener.ScreenRows(baseline, fresh.Values);
        var sf = PythonReference.Run(
            "import json,sys; from scipy.stats import chi2; d=json.load(sys.stdin); print(json.dumps([float(chi2.sf(x, d['p'])) for x in d['x']]))",
            new { x = results.Select(r => r.SquaredDistance).ToArray(), p = 7 });
        Tolerance.Close(sf.Doubles(), results.Select(r => r.PValue).ToArray(), abs: 1e-300, rel: 1e-9, what: "p-value");
        Assert.Contains(results, r => r.PValue < 1e-10);
    }

    [Fact]
    public void WithoutRulesASampleIsFlaggedExactlyWhenItsSquaredDistanceExceedsTheThreshold()
    {
        var baseline = Fit(ScatterMethod.Robust);
        var fresh = MonitoringData.Reference(seed: 83, n: 300, outlierShare: 0.3, shift: 0.8);
        var results = Screener.ScreenRows(baseline, fresh.Values);
        Assert.All(results, r => Assert.Equal(r.SquaredDistance > baseline.Threshold, r.Flagged));
        Assert.All(results, r => Assert.Equal(r.Flagged, r.ExceedsThreshold));
        Assert.Contains(results, r => r.Flagged);
        Assert.Contains(results, r => !r.Flagged);
        Assert.All(results, r => Tolerance.Close(Math.Sqrt(r.SquaredDistance), r.Distance));
    }

    [Fact]
    public void RulesLimitTheRatiosValueNotItsLog()
    {
        // Rules are on x_a / x_b (or Σ_A x / Σ_B x), not on ln: the centre's Na/Cl is about 0.75, so max 0.7
        // is violated and min 0.5 is not, although ln 0.75 ≈ −0.29 lies below both.
        var naCl = LogRatio.Create(MonitoringData.Ions, ["Na"], ["Cl"], null, "/rules/0/ratio");
        var hardness = LogRatio.Create(MonitoringData.Ions, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation, "/rules/2/ratio");
        var options = new BaselineOptions { Rules = [new RatioRule(naCl, null, 0.7), new RatioRule(naCl, 0.5, null), new RatioRule(hardness, 0.1, 100)] };
        var baseline = Fit(ScatterMethod.Robust, options: options);
        var sample = Scaled(baseline);
        var ratio = sample["Na"] / sample["Cl"];
        Assert.InRange(ratio, 0.7, 1.0);

        var result = Screener.Screen(baseline, sample);
        Assert.True(result.SquaredDistance < 1e-20);
        Assert.False(result.ExceedsThreshold);
        Assert.True(result.Flagged);
        var violation = Assert.Single(result.RuleViolations);
        Assert.Equal(new RuleViolation("Na/Cl", ratio, null, 0.7), violation);

        // The amalgamation's value: (Ca + Mg) / (Na + K), here pushed above its max of 100.
        var hard = Screener.Screen(baseline, Scaled(baseline, ("Ca", 200), ("Mg", 200)));
        var amalgamation = hard.RuleViolations.Single(v => v.Label == "(Ca+Mg)/(Na+K)");
        var s = Scaled(baseline, ("Ca", 200), ("Mg", 200));
        Tolerance.Close((s["Ca"] + s["Mg"]) / (s["Na"] + s["K"]), amalgamation.Value);
    }

    [NeedsPythonFact]
    public void ReasonZScoresAreThoseOfEachPairwiseLogRatioInTheReferenceSamples()
    {
        // For a classical baseline, aᵀ μ_clr and aᵀ S_clr a are the mean and variance (ddof = 1) of the log-ratio
        // aᵀ ln x itself (linearity of mean and covariance); numpy computes those directly from the compositions.
        var baseline = Fit(ScatterMethod.Classical, CoordinateMaps.Alr(J));
        var sample = Scaled(baseline, ("Na", 3));
        var result = Screener.Screen(baseline, sample, reasonCount: 28);
        var numpy = PythonReference.Run(
            """
            import json, sys
            import numpy as np
            d = json.load(sys.stdin)
            L = np.log(np.array(d['x'])); s = np.log(np.array(d['s'])); out = {}
            for a in range(8):
                for b in range(a + 1, 8):
                    r = L[:, a] - L[:, b]; m = r.mean(); sd = r.std(ddof=1)
                    out['%d,%d' % (a, b)] = [float((s[a] - s[b] - m) / sd), float(np.exp(m - 1.959963984540054 * sd)), float(np.exp(m + 1.959963984540054 * sd))]
            print(json.dumps(out))
            """,
            new { x = CoordinateMaps.Rows(Reference.Values, J), s = MonitoringData.Ions.Select(i => sample[i]).ToArray() });

        Assert.Equal(28, result.Reasons.Count);
        for (var a = 0; a < J; a++)
        {
            for (var b = a + 1; b < J; b++)
            {
                var label = $"{MonitoringData.Ions[a]}/{MonitoringData.Ions[b]}";
                var reason = result.Reasons.Single(r => r.Label == label);
                var expected = numpy.GetProperty($"{a},{b}").Doubles();
                Tolerance.Close(expected[0], reason.Z, abs: 1e-9, rel: 1e-9, what: $"z {label}");
                Tolerance.Close(expected[1], reason.ExpectedLow, abs: 1e-12, rel: 1e-9, what: $"low {label}");
                Tolerance.Close(expected[2], reason.ExpectedHigh, abs: 1e-12, rel: 1e-9, what: $"high {label}");
                Tolerance.Close(sample[MonitoringData.Ions[a]] / sample[MonitoringData.Ions[b]], reason.Value, what: $"value {label}");
            }
        }

        // Sorted by |z|, largest first; tripling Na puts Na ratios on top.
        Assert.Equal(result.Reasons.OrderByDescending(r => Math.Abs(r.Z)).Select(r => r.Label), result.Reasons.Select(r => r.Label));
        Assert.Contains("Na", result.Reasons[0].Label, StringComparison.Ordinal);
    }

    [Fact]
    public void ByDefaultThreeReasonsAreReportedTheLargestOfAll()
    {
        var baseline = Fit(ScatterMethod.Robust);
        var sample = Scaled(baseline, ("NO3", 5));
        var all = Screener.Screen(baseline, sample, reasonCount: 28).Reasons;
        var top = Screener.Screen(baseline, sample).Reasons;
        Assert.Equal(Screener.DefaultReasonCount, top.Count);
        Assert.Equal(all.Take(3), top);
        Assert.All(top, r => Assert.Contains("NO3", r.Label, StringComparison.Ordinal));
        Assert.Empty(Screener.Screen(baseline, sample, reasonCount: 0).Reasons);
        Assert.Throws<ArgumentOutOfRangeException>(() => Screener.Screen(baseline, sample, reasonCount: -1));
    }

    [Fact]
    public void AReasonsExpectedRangeContainsTheBaselinesTypicalValues()
    {
        // The expected range exp(m ± 1.96 s) is the central 95% range at the normal model: on clean reference data
        // it holds the median of each ratio and close to 95% of the reference values.
        var clean = MonitoringData.Reference(seed: 84, n: 2000);
        var baseline = Fit(ScatterMethod.Robust, reference: clean);
        var reasons = Screener.Screen(baseline, MonitoringData.Sample(clean, 0), reasonCount: 28).Reasons;
        Assert.Equal(28, reasons.Count);
        foreach (var reason in reasons)
        {
            var parts = reason.Label.Split('/');
            var values = Enumerable.Range(0, clean.RowCount)
                .Select(i => clean.Row(i)[clean.IndexOf(parts[0])] / clean.Row(i)[clean.IndexOf(parts[1])])
                .Order().ToArray();
            var median = values[values.Length / 2];
            Assert.InRange(median, reason.ExpectedLow, reason.ExpectedHigh);
            var inside = values.Count(v => v >= reason.ExpectedLow && v <= reason.ExpectedHigh) / (double)values.Length;
            Assert.InRange(inside, 0.93, 0.97);
        }

        // The centre composition itself: every z is 0 and every value inside its range.
        Assert.All(Screener.Screen(baseline, Scaled(baseline), reasonCount: 28).Reasons, r =>
        {
            Assert.InRange(r.Z, -1e-9, 1e-9);
            Assert.InRange(r.Value, r.ExpectedLow, r.ExpectedHigh);
        });
    }

    [Fact]
    public void ANamedAmalgamationRatioIsAReasonWithItsOwnLocationAndScale()
    {
        var hardness = LogRatio.Create(MonitoringData.Ions, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation, "/namedRatios/0", "hardness", "alkalis");
        var baseline = Fit(ScatterMethod.Robust, options: new BaselineOptions { NamedRatios = [hardness] });
        var named = baseline.NamedRatios.Single();
        var sample = Scaled(baseline, ("Ca", 4), ("Mg", 4));
        var reasons = Screener.Screen(baseline, sample, reasonCount: 29).Reasons;
        var reason = reasons.Single(r => r.Label == "hardness/alkalis");
        var value = (sample["Ca"] + sample["Mg"]) / (sample["Na"] + sample["K"]);
        Tolerance.Close(value, reason.Value);
        Tolerance.Close((Math.Log(value) - named.Location) / named.Scale, reason.Z);
        Tolerance.Close(Math.Exp(named.Location - (Baseline.ExpectedRangeZ * named.Scale)), reason.ExpectedLow);
        Tolerance.Close(Math.Exp(named.Location + (Baseline.ExpectedRangeZ * named.Scale)), reason.ExpectedHigh);
    }

    [Fact]
    public void ReasonsDoNotDependOnTheCoordinatesOfTheBaseline()
    {
        var sample = MonitoringData.Sample(MonitoringData.Reference(seed: 85, n: 5, outlierShare: 1, shift: 1), 2);
        var ilr = Screener.Screen(Fit(ScatterMethod.Robust), sample, reasonCount: 5).Reasons;
        var alr = Screener.Screen(Fit(ScatterMethod.Robust, CoordinateMaps.Alr(J)), sample, reasonCount: 5).Reasons;
        Assert.Equal(ilr.Select(r => r.Label), alr.Select(r => r.Label));
        Tolerance.Close(ilr.Select(r => r.Z).ToArray(), alr.Select(r => r.Z).ToArray(), abs: 1e-9, rel: 1e-9);
    }

    [Fact]
    public void ABatchGivesTheSameResultsAsOneSampleAtATimeAndAsRows()
    {
        var baseline = Fit(ScatterMethod.Robust);
        var fresh = MonitoringData.Reference(seed: 86, n: 25, outlierShare: 0.4);
        var samples = Enumerable.Range(0, fresh.RowCount).Select(i => (IReadOnlyDictionary<string, double>)MonitoringData.Sample(fresh, i)).ToArray();
        var batch = Screener.ScreenMany(baseline, samples);
        var rows = Screener.ScreenRows(baseline, fresh.Values);
        var distances = new double[fresh.RowCount];
        Screener.SquaredDistances(baseline, fresh.Values, distances);
        for (var i = 0; i < samples.Length; i++)
        {
            var single = Screener.Screen(baseline, samples[i]);
            Assert.Equal(single.SquaredDistance, batch[i].SquaredDistance);
            Assert.Equal(single.Reasons, batch[i].Reasons);
            Assert.Equal(rows[i].SquaredDistance, batch[i].SquaredDistance);
            Assert.Equal(rows[i].Reasons, batch[i].Reasons);
            Assert.Equal(rows[i].SquaredDistance, distances[i]);
        }
    }

    [Theory]
    [InlineData("Na", double.NaN, ProblemTypes.NonFiniteValue, "/samples/3/values/Na")]
    [InlineData("Na", double.PositiveInfinity, ProblemTypes.NonFiniteValue, "/samples/3/values/Na")]
    [InlineData("Cl", -2.0, ProblemTypes.NegativeValue, "/samples/3/values/Cl")]
    [InlineData("NO3", 0.0, ProblemTypes.ZeroValue, "/samples/3/values/NO3")]
    [InlineData("K", null, ProblemTypes.MissingPart, "/samples/3/values/K")]
    [InlineData("Fe/Mn~", 1.0, ProblemTypes.UnknownPart, "/samples/3/values/Fe~1Mn~0")]
    public void ABadValueInABatchIsAProblemPointingAtItAndNothingIsScreened(string part, double? value, string type, string pointer)
    {
        var baseline = Fit(ScatterMethod.Classical);
        var samples = Enumerable.Range(0, 5).Select(i => MonitoringData.Sample(Reference, i)).ToArray();
        if (value is { } v)
        {
            samples[3][part] = v;
        }
        else
        {
            samples[3].Remove(part);
        }

        var ex = Assert.Throws<CompositionException>(() => Screener.ScreenMany(baseline, samples));
        Assert.Equal(type, ex.ProblemType);
        Assert.Equal(pointer, Assert.Single(ex.Errors).Pointer);
    }

    [Fact]
    public void EveryBadValueOfABatchIsListedInOrder()
    {
        var baseline = Fit(ScatterMethod.Classical);
        var samples = Enumerable.Range(0, 4).Select(i => MonitoringData.Sample(Reference, i)).ToArray();
        samples[1]["Mg"] = 0;
        samples[2].Remove("SO4");
        samples[2]["SO4 "] = 3;
        var ex = Assert.Throws<CompositionException>(() => Screener.ScreenMany(baseline, samples));
        Assert.Equal(ProblemTypes.ZeroValue, ex.ProblemType);
        Assert.Equal(["/samples/1/values/Mg", "/samples/2/values/SO4", "/samples/2/values/SO4 "], ex.Errors.Select(e => e.Pointer));
    }

    [Fact]
    public void OneSampleAndRowsPointAtTheirOwnLocations()
    {
        var baseline = Fit(ScatterMethod.Classical);
        var sample = MonitoringData.Sample(Reference, 0);
        sample["Ca"] = -1;
        Assert.Equal("/sample/values/Ca", Assert.Single(Assert.Throws<CompositionException>(() => Screener.Screen(baseline, sample)).Errors).Pointer);

        var rows = (double[])Reference.Values[..(3 * J)].Clone();
        rows[(2 * J) + 4] = 0;
        var ex = Assert.Throws<CompositionException>(() => Screener.ScreenRows(baseline, rows));
        Assert.Equal(ProblemTypes.ZeroValue, ex.ProblemType);
        Assert.Equal("/rows/2/4", Assert.Single(ex.Errors).Pointer);
        Assert.Throws<ArgumentException>(() => Screener.ScreenRows(baseline, rows.AsSpan(0, J + 1)));
    }
}
