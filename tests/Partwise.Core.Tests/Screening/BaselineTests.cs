using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Screening;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

public class BaselineTests
{
    private const int J = 8;

    // A spanning tree of the eight ions: Na/Cl, Ca/Mg, Ca/HCO3, Mg/SO4, K/Na, NO3/Cl, SO4/Cl.
    private static readonly (int, int)[] Tree = [(2, 5), (0, 1), (0, 4), (1, 6), (3, 2), (7, 5), (6, 5)];

    public static TheoryData<ScatterMethod> Methods => new() { ScatterMethod.Classical, ScatterMethod.Robust };

    private static FittedBaseline Fit(CompositionTable table, double[] map, ScatterMethod method, BaselineOptions? options = null) =>
        BaselineFit.Fit(table.Parts, map, CoordinateMaps.Apply(table, map), (options ?? new BaselineOptions()) with { Scatter = method }, table);

    [Theory]
    [MemberData(nameof(Methods))]
    public void MahalanobisDistanceIsTheSameInIlrAlrAndSpanningTreeCoordinates(ScatterMethod method)
    {
        // d² is invariant under a full-rank linear change of log-ratio coordinates (Filzmoser & Hron 2008,
        // Math. Geosci. 40:233-248); the MCD is affine equivariant, so the robust fit keeps it too.
        var reference = MonitoringData.Reference(seed: 31, n: 300, outlierShare: 0.1);
        var fresh = MonitoringData.Reference(seed: 32, n: 50, outlierShare: 0.2, shift: 1.2);
        var fits = new[] { CoordinateMaps.Pivot(J), CoordinateMaps.Alr(J), CoordinateMaps.Pairwise(J, Tree) }
            .Select(map => Fit(reference, map, method)).ToArray();

        var freshDistances = fits.Select(f => Screener.ScreenRows(f.Baseline, fresh.Values).Select(r => r.SquaredDistance).ToArray()).ToArray();
        for (var k = 1; k < fits.Length; k++)
        {
            Tolerance.Close(fits[0].ReferenceSquaredDistances, fits[k].ReferenceSquaredDistances, abs: 1e-9, rel: 1e-9, what: $"reference d² in map {k}");
            Tolerance.Close(freshDistances[0], freshDistances[k], abs: 1e-9, rel: 1e-9, what: $"fresh d² in map {k}");

            // G Σ Gᵀ does not depend on the basis either: the clr form is shared by all three.
            Tolerance.Close(fits[0].Baseline.ClrLocation, fits[k].Baseline.ClrLocation, abs: 1e-10, rel: 1e-9, what: "μ_clr");
            Tolerance.Close(fits[0].Baseline.ClrScatter, fits[k].Baseline.ClrScatter, abs: 1e-10, rel: 1e-9, what: "S_clr");
        }

        Assert.All(fits, f => Assert.Equal(J - 1, f.Baseline.DegreesOfFreedom));
    }

    [NeedsPythonFact]
    public void ClassicalDistancesAndClrFormEqualNumpysFromTheRawCompositions()
    {
        // numpy: the mean and covariance (ddof = 1) of pivot coordinates, d² = (y − μ)ᵀ Σ⁻¹ (y − μ); and the mean and
        // covariance of clr(x) = ln x − mean(ln x), which the clr form G μ, G Σ Gᵀ must reproduce for full-rank maps.
        var reference = MonitoringData.Reference(seed: 41, n: 120, outlierShare: 0.05);
        var fresh = MonitoringData.Reference(seed: 42, n: 20, outlierShare: 0.5);
        var numpy = PythonReference.Run(
            """
            import json, sys
            import numpy as np
            d = json.load(sys.stdin)
            L = np.log(np.array(d['ref'])); F = np.log(np.array(d['fresh'])); V = np.array(d['v'])
            Y = L @ V; mu = Y.mean(0); P = np.linalg.inv(np.cov(Y.T, ddof=1))
            d2 = lambda Z: np.einsum('ij,jk,ik->i', Z - mu, P, Z - mu)
            C = L - L.mean(1, keepdims=True)
            print(json.dumps({'ref': d2(Y).tolist(), 'fresh': d2(F @ V).tolist(),
                              'clrMean': C.mean(0).tolist(), 'clrCov': np.cov(C.T, ddof=1).ravel().tolist()}))
            """,
            new { @ref = CoordinateMaps.Rows(reference.Values, J), fresh = CoordinateMaps.Rows(fresh.Values, J), v = CoordinateMaps.Rows(CoordinateMaps.Pivot(J), J - 1) });

        foreach (var map in new[] { CoordinateMaps.Pivot(J), CoordinateMaps.Alr(J), CoordinateMaps.Pairwise(J, Tree) })
        {
            var fitted = Fit(reference, map, ScatterMethod.Classical);
            Tolerance.Close(numpy.GetProperty("ref").Doubles(), fitted.ReferenceSquaredDistances, abs: 1e-9, rel: 1e-9, what: "reference d²");
            var d2 = Screener.ScreenRows(fitted.Baseline, fresh.Values).Select(r => r.SquaredDistance).ToArray();
            Tolerance.Close(numpy.GetProperty("fresh").Doubles(), d2, abs: 1e-9, rel: 1e-9, what: "fresh d²");
            Tolerance.Close(numpy.GetProperty("clrMean").Doubles(), fitted.Baseline.ClrLocation, abs: 1e-12, rel: 1e-9, what: "μ_clr");
            Tolerance.Close(numpy.GetProperty("clrCov").Doubles(), fitted.Baseline.ClrScatter, abs: 1e-12, rel: 1e-9, what: "S_clr");
        }
    }

    [NeedsPythonFact]
    public void APartialRatioSetMeasuresDistanceInItsOwnRatiosAndExplainsOnlyRatiosInItsSpan()
    {
        // Three ratios of eight parts (p = 3 < J − 1): d² is numpy's on those three log-ratios, and the pairwise
        // ratios the baseline can explain are those in their span: Ca/Mg, and Na/K, Na/Cl, K/Cl (one connected
        // component Na–K–Cl), each with the reference mean and standard deviation of its own log-ratio.
        var reference = MonitoringData.Reference(seed: 51, n: 80);
        var map = CoordinateMaps.Pairwise(J, (2, 5), (0, 1), (3, 2));
        var fitted = Fit(reference, map, ScatterMethod.Classical);
        Assert.Equal(3, fitted.Baseline.DegreesOfFreedom);
        var numpy = PythonReference.Run(
            """
            import json, sys
            import numpy as np
            d = json.load(sys.stdin)
            X = np.array(d['x']); L = np.log(X)
            Y = np.stack([L[:, 2] - L[:, 5], L[:, 0] - L[:, 1], L[:, 3] - L[:, 2]], 1)
            mu = Y.mean(0); P = np.linalg.inv(np.cov(Y.T, ddof=1))
            pairs = {}
            for a, b in [(0, 1), (2, 3), (2, 5), (3, 5)]:
                r = L[:, a] - L[:, b]
                pairs['%d,%d' % (a, b)] = [float(r.mean()), float(r.std(ddof=1))]
            print(json.dumps({'d2': np.einsum('ij,jk,ik->i', Y - mu, P, Y - mu).tolist(), 'pairs': pairs}))
            """,
            new { x = CoordinateMaps.Rows(reference.Values, J) });
        Tolerance.Close(numpy.GetProperty("d2").Doubles(), fitted.ReferenceSquaredDistances, abs: 1e-9, rel: 1e-9);

        var sample = MonitoringData.Sample(reference, 7);
        var reasons = Screener.Screen(fitted.Baseline, sample, reasonCount: 28).Reasons;
        Assert.Equal(["Ca/Mg", "K/Cl", "Na/Cl", "Na/K"], reasons.Select(r => r.Label).Order(StringComparer.Ordinal));
        foreach (var (a, b) in new[] { (0, 1), (2, 3), (2, 5), (3, 5) })
        {
            var ms = numpy.GetProperty("pairs").GetProperty($"{a},{b}").Doubles();
            var reason = reasons.Single(r => r.Label == $"{MonitoringData.Ions[a]}/{MonitoringData.Ions[b]}");
            Tolerance.Close((Math.Log(sample[MonitoringData.Ions[a]] / sample[MonitoringData.Ions[b]]) - ms[0]) / ms[1], reason.Z, abs: 1e-9, rel: 1e-9, what: reason.Label);
        }
    }

    [Fact]
    public void ThresholdIsTheChiSquareQuantileOfTheCutoffWithPDegreesOfFreedom()
    {
        var reference = MonitoringData.Reference(seed: 61, n: 60);
        var fitted = Fit(reference, CoordinateMaps.Pivot(J), ScatterMethod.Classical, new BaselineOptions { Cutoff = 0.99 });
        Assert.Equal(0.99, fitted.Baseline.Cutoff);
        Assert.Equal(ChiSquare.Quantile(0.99, 7), fitted.Baseline.Threshold);

        // 18.475 is χ²(0.99; 7) in the NIST/SEMATECH table 1.3.6.7.4 (from the NIST table, from memory).
        Tolerance.Close(18.475, fitted.Baseline.Threshold, abs: 5e-4, rel: 0);
        Assert.Equal(
            fitted.ReferenceSquaredDistances.Count(d => d > fitted.Baseline.Threshold),
            fitted.ReferenceFlagged);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(1.0)]
    [InlineData(-0.1)]
    [InlineData(1.5)]
    [InlineData(double.NaN)]
    public void ACutoffOutsideTheOpenUnitIntervalIsAProblemAtCutoff(double cutoff)
    {
        var reference = MonitoringData.Reference(seed: 62, n: 40);
        var map = CoordinateMaps.Pivot(J);
        var fit = Assert.Throws<CompositionException>(() => Fit(reference, map, ScatterMethod.Robust, new BaselineOptions { Cutoff = cutoff }));
        Assert.Equal(ProblemTypes.InvalidOption, fit.ProblemType);
        Assert.Equal("/cutoff", Assert.Single(fit.Errors).Pointer);

        var good = Fit(reference, map, ScatterMethod.Classical).Baseline;
        var create = Assert.Throws<CompositionException>(() => Baseline.Create(good.Parts, map, good.Location, good.Covariance, ScatterMethod.Classical, cutoff));
        Assert.Equal("/cutoff", Assert.Single(create.Errors).Pointer);
    }

    [Fact]
    public void ABaselineRebuiltFromItsDocumentScreensExactlyTheSame()
    {
        var reference = MonitoringData.Reference(seed: 63, n: 150, outlierShare: 0.1);
        var map = CoordinateMaps.Pivot(J);
        var original = Fit(reference, map, ScatterMethod.Robust).Baseline;
        var rebuilt = Baseline.Create(original.Parts, original.CoordinateMap, original.Location, original.Covariance, original.Scatter, original.Cutoff);
        var fresh = MonitoringData.Reference(seed: 64, n: 30, outlierShare: 0.3);
        Assert.Equal(
            Screener.ScreenRows(original, fresh.Values).Select(r => (r.SquaredDistance, r.PValue, r.Flagged, string.Join(',', r.Reasons))),
            Screener.ScreenRows(rebuilt, fresh.Values).Select(r => (r.SquaredDistance, r.PValue, r.Flagged, string.Join(',', r.Reasons))));
        Assert.Equal(original.Precision, rebuilt.Precision);
    }

    [Fact]
    public void PrecisionAndCholeskyFactorReproduceTheCovariance()
    {
        var b = Fit(MonitoringData.Reference(seed: 65, n: 90), CoordinateMaps.Alr(J), ScatterMethod.Classical).Baseline;
        var p = b.Dimension;
        for (var r = 0; r < p; r++)
        {
            for (var c = 0; c < p; c++)
            {
                double identity = 0, product = 0;
                for (var k = 0; k < p; k++)
                {
                    identity += b.Covariance[(r * p) + k] * b.Precision[(k * p) + c];
                    product += b.CholeskyFactor[(r * p) + k] * b.CholeskyFactor[(c * p) + k];
                }

                Tolerance.Close(r == c ? 1 : 0, identity, abs: 1e-9, rel: 0, what: $"Σ Σ⁻¹ [{r},{c}]");
                Tolerance.Close(b.Covariance[(r * p) + c], product, abs: 1e-14, rel: 1e-12, what: $"L Lᵀ [{r},{c}]");
            }
        }
    }

    [Fact]
    public void AModerateOutlierThatTheClassicalBaselineMissesIsCaughtByTheRobustOne()
    {
        // Masking (Filzmoser & Hron 2008; Rousseeuw & Van Driessen 1999): 10% gross outliers along the saline
        // direction (Na and Cl raised e^2.5-fold) inflate the classical covariance in that direction, so a sample
        // with Na and Cl raised only e^0.4-fold (by half) stays inside the classical ellipsoid but not inside the robust one.
        var reference = MonitoringData.Reference(seed: 11, n: 200, outlierShare: 0.1);
        var map = CoordinateMaps.Pivot(J);
        var robust = Fit(reference, map, ScatterMethod.Robust).Baseline;
        var classical = Fit(reference, map, ScatterMethod.Classical).Baseline;

        var centre = robust.ClrLocation.Select(Math.Exp).ToArray();
        var sample = MonitoringData.Ions.Select((ion, k) => (ion, value: centre[k] * (ion is "Na" or "Cl" ? Math.Exp(0.4) : 1)))
            .ToDictionary(t => t.ion, t => t.value);
        var byRobust = Screener.Screen(robust, sample);
        var byClassical = Screener.Screen(classical, sample);
        Assert.True(byRobust.Flagged, $"robust d² {byRobust.SquaredDistance} ≤ {robust.Threshold}");
        Assert.False(byClassical.Flagged, $"classical d² {byClassical.SquaredDistance} > {classical.Threshold}");
        Assert.Contains(byRobust.Reasons, r => r.Label.Contains("Na", StringComparison.Ordinal) || r.Label.Contains("Cl", StringComparison.Ordinal));
    }

    [Fact]
    public void LinearlyDependentRatiosAreASingularRatioSet()
    {
        // Na/Cl, K/Na and K/Cl close a cycle: ln(K/Cl) = ln(K/Na) + ln(Na/Cl).
        var map = CoordinateMaps.Pairwise(J, (2, 5), (3, 2), (3, 5));
        double[] location = [0, 0, 0];
        double[] covariance = [1, 0, 0, 0, 1, 0, 0, 0, 1];
        var ex = Assert.Throws<CompositionException>(() => Baseline.Create(MonitoringData.Ions, map, location, covariance, ScatterMethod.Classical));
        Assert.Equal(ProblemTypes.SingularRatioSet, ex.ProblemType);
        Assert.Equal("/ratios", Assert.Single(ex.Errors).Pointer);
    }

    [Fact]
    public void ACoordinateThatIsNotALogContrastIsRefused()
    {
        var map = CoordinateMaps.Alr(J);
        map[0] = 2;
        var ex = Assert.Throws<ArgumentException>(() => Baseline.Create(MonitoringData.Ions, map, new double[7], Identity(7), ScatterMethod.Classical));
        Assert.Contains("log-contrast", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ABadLocationOrCovarianceInADocumentPointsAtIt()
    {
        var map = CoordinateMaps.Pivot(J);
        var asymmetric = Identity(7);
        asymmetric[7] = 0.5;
        var notPositive = Identity(7);
        notPositive[8] = -1;
        var location = new double[7];
        location[2] = double.NaN;

        var cases = new (Func<Baseline> Create, string Type, string Pointer)[]
        {
            (() => Baseline.Create(MonitoringData.Ions, map, new double[7], asymmetric, ScatterMethod.Robust), ProblemTypes.InvalidInput, "/covariance/1/0"),
            (() => Baseline.Create(MonitoringData.Ions, map, new double[7], notPositive, ScatterMethod.Robust), ProblemTypes.SingularScatter, "/covariance"),
            (() => Baseline.Create(MonitoringData.Ions, map, location, Identity(7), ScatterMethod.Robust), ProblemTypes.NonFiniteValue, "/location/2"),
            (() => Baseline.Create(MonitoringData.Ions, map, new double[7], Identity(6), ScatterMethod.Robust), ProblemTypes.InvalidInput, "/covariance"),
            (() => Baseline.Create(["Ca", "Ca"], CoordinateMaps.Pivot(2), new double[1], Identity(1), ScatterMethod.Robust), ProblemTypes.InvalidInput, "/parts/1"),
        };
        foreach (var (create, type, pointer) in cases)
        {
            var ex = Assert.Throws<CompositionException>(create);
            Assert.Equal(type, ex.ProblemType);
            Assert.Equal(pointer, Assert.Single(ex.Errors).Pointer);
        }
    }

    [NeedsPythonFact]
    public void NamedRatiosKeepTheMedianAndScaledMadOrTheMeanAndSdOfTheirLogs()
    {
        // Robust: median and 1.4826 · MAD (scipy.stats.median_abs_deviation with scale='normal', i.e. 1/Φ⁻¹(0.75);
        // Rousseeuw & Croux 1993); classical: mean and standard deviation with ddof = 1 (numpy).
        var reference = MonitoringData.Reference(seed: 71, n: 101, outlierShare: 0.1);
        var hardness = LogRatio.Create(MonitoringData.Ions, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation, "/namedRatios/0", "hardness", "alkalis");
        var options = new BaselineOptions { NamedRatios = [hardness] };
        var robust = Fit(reference, CoordinateMaps.Pivot(J), ScatterMethod.Robust, options).Baseline.NamedRatios.Single();
        var classical = Fit(reference, CoordinateMaps.Pivot(J), ScatterMethod.Classical, options).Baseline.NamedRatios.Single();
        var reference2 = PythonReference.Run(
            """
            import json, sys
            import numpy as np
            from scipy.stats import median_abs_deviation
            X = np.array(json.load(sys.stdin)['x'])
            r = np.log((X[:, 0] + X[:, 1]) / (X[:, 2] + X[:, 3]))
            print(json.dumps({'median': float(np.median(r)), 'mad': float(median_abs_deviation(r, scale='normal')),
                              'mean': float(r.mean()), 'sd': float(r.std(ddof=1))}))
            """,
            new { x = CoordinateMaps.Rows(reference.Values, J) });
        Assert.Equal("hardness/alkalis", robust.Ratio.Label);
        Tolerance.Close(reference2.GetProperty("median").GetDouble(), robust.Location, abs: 1e-14, rel: 1e-12);
        Tolerance.Close(reference2.GetProperty("mad").GetDouble(), robust.Scale, abs: 1e-14, rel: 1e-12);
        Tolerance.Close(reference2.GetProperty("mean").GetDouble(), classical.Location, abs: 1e-14, rel: 1e-12);
        Tolerance.Close(reference2.GetProperty("sd").GetDouble(), classical.Scale, abs: 1e-14, rel: 1e-12);
    }

    [Fact]
    public void NamedRatiosNeedTheReferenceCompositionsAndAZeroInThemPointsAtTheCell()
    {
        var reference = MonitoringData.Reference(seed: 72, n: 40);
        var map = CoordinateMaps.Pivot(J);
        var y = CoordinateMaps.Apply(reference, map);
        var ratio = LogRatio.Create(MonitoringData.Ions, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation, "/namedRatios/0");
        var options = new BaselineOptions { NamedRatios = [ratio] };
        Assert.Throws<ArgumentException>(() => BaselineFit.Fit(reference.Parts, map, y, options));

        var values = (double[])reference.Values.Clone();
        values[(5 * J) + 3] = 0;
        var withZero = CompositionTable.FromValues(MonitoringData.Ions, values);
        var ex = Assert.Throws<CompositionException>(() => BaselineFit.Fit(reference.Parts, map, y, options, withZero));
        Assert.Equal(ProblemTypes.ZeroValue, ex.ProblemType);
        Assert.Equal("/rows/5/3", Assert.Single(ex.Errors).Pointer);
    }

    private static double[] Identity(int p)
    {
        var m = new double[p * p];
        for (var k = 0; k < p; k++)
        {
            m[(k * p) + k] = 1;
        }

        return m;
    }
}
