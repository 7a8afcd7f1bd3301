using Partwise.Core.Screening;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

public class InvarianceTests
{
    // Any invertible p × p matrix M turns coordinates y = (ln x) A into y M = (ln x)(A M); d² and the clr form are
    // unchanged (Filzmoser & Hron 2008). Checked on seeded random tables at several sizes, both estimators.
    [Theory]
    [InlineData(1, 3, 30)]
    [InlineData(2, 5, 80)]
    [InlineData(3, 12, 250)]
    [InlineData(4, 6, 700)]
    public void DistancesAndClrFormSurviveAnyInvertibleChangeOfCoordinates(int seed, int parts, int n)
    {
        var table = SeededCompositions.Table(seed, n, parts);
        var fresh = SeededCompositions.Table(seed + 100, 20, parts, sigma: 1.5);
        var p = parts - 1;
        var pivot = CoordinateMaps.Pivot(parts);
        var random = new Random(seed);
        var m = new double[p * p];
        for (var k = 0; k < m.Length; k++)
        {
            m[k] = (k % (p + 1) == 0 ? 2 : 0) + SeededCompositions.Gaussian(random);
        }

        var mixed = new double[parts * p];
        for (var r = 0; r < parts; r++)
        {
            for (var c = 0; c < p; c++)
            {
                for (var k = 0; k < p; k++)
                {
                    mixed[(r * p) + c] += pivot[(r * p) + k] * m[(k * p) + c];
                }
            }
        }

        foreach (var method in new[] { ScatterMethod.Classical, ScatterMethod.Robust })
        {
            var options = new BaselineOptions { Scatter = method };
            var a = BaselineFit.Fit(table.Parts, pivot, CoordinateMaps.Apply(table, pivot), options).Baseline;
            var b = BaselineFit.Fit(table.Parts, mixed, CoordinateMaps.Apply(table, mixed), options).Baseline;
            var da = Screener.ScreenRows(a, fresh.Values).Select(r => r.SquaredDistance).ToArray();
            var db = Screener.ScreenRows(b, fresh.Values).Select(r => r.SquaredDistance).ToArray();
            Tolerance.Close(da, db, abs: 1e-8, rel: 1e-8, what: $"{method} d²");
            Tolerance.Close(a.ClrScatter, b.ClrScatter, abs: 1e-10, rel: 1e-8, what: $"{method} S_clr");
        }
    }

    [Fact]
    public void TwoPartsGiveOneCoordinateAndOneReason()
    {
        // J = 2: p = 1, the robust fit takes the exact univariate MCD, and the only reason is the one pairwise ratio.
        var table = SeededCompositions.Table(9, 60, 2);
        var map = CoordinateMaps.Pivot(2);
        var baseline = BaselineFit.Fit(table.Parts, map, CoordinateMaps.Apply(table, map)).Baseline;
        Assert.Equal(1, baseline.DegreesOfFreedom);
        var result = Screener.Screen(baseline, new Dictionary<string, double> { ["p0"] = 1, ["p1"] = 50 });
        var reason = Assert.Single(result.Reasons);
        Assert.Equal("p0/p1", reason.Label);

        // With one coordinate z² is d²: the pairwise log-ratio is the coordinate up to the factor 1/√2.
        Tolerance.Close(result.SquaredDistance, reason.Z * reason.Z, abs: 1e-9, rel: 1e-9);
    }
}
