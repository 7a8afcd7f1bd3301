using System.Text.Json;
using Partwise.Core.Screening;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

public class BaselineBiplotTests
{
    private const int J = 8;

    private static readonly CompositionTable Reference = MonitoringData.Reference(seed: 91, n: 300, outlierShare: 0.05);

    private static Baseline Fit(double[] map, ScatterMethod method = ScatterMethod.Robust) =>
        BaselineFit.Fit(Reference.Parts, map, CoordinateMaps.Apply(Reference, map), new BaselineOptions() with { Scatter = method }, Reference).Baseline;

    private static CompositionTable Fresh => MonitoringData.Reference(seed: 92, n: 30, outlierShare: 0.4, shift: 1.5);

    private static BiplotPlacement[] PlaceAll(BaselineBiplot biplot, CompositionTable table) =>
        [.. Enumerable.Range(0, table.RowCount).Select(i => biplot.Place(table.Values.AsSpan(i * J, J)))];

    [NeedsPythonFact]
    public void AxesVariancesAndScoresAgreeWithNumpyEighUpToSign()
    {
        // Reference: numpy.linalg.eigh of S_clr (tests/reference/biplot_reference.py), for full-rank pivot
        // coordinates and for a partial set of three pairwise ratios (rank 3 < J − 1).
        foreach (var map in new[] { CoordinateMaps.Pivot(J), CoordinateMaps.Pairwise(J, (2, 5), (0, 4), (1, 0)) })
        {
            var baseline = Fit(map);
            var biplot = BaselineBiplot.Create(baseline);
            var fresh = Fresh;
            var reference = PythonReference.Run(
                ReferenceFiles.Read("biplot_reference.py"),
                new
                {
                    scatter = CoordinateMaps.Rows([.. baseline.ClrScatter], J),
                    location = baseline.ClrLocation,
                    values = CoordinateMaps.Rows(fresh.Values, J),
                    p = baseline.Dimension,
                });

            var variances = reference.GetProperty("variances").Deserialize<double[]>()!;
            var axes = reference.GetProperty("axes").Deserialize<double[][]>()!;
            var scores = reference.GetProperty("scores").Deserialize<double[][]>()!;
            var scale = variances[0];
            Tolerance.Close(variances, biplot.Variances, 1e-12 * scale, 0, "variances");
            Tolerance.Close(reference.GetProperty("trace").GetDouble(), biplot.TotalVariance, 1e-14, 1e-12, "trace");
            var placed = PlaceAll(biplot, fresh);
            for (var k = 0; k < baseline.Dimension; k++)
            {
                // Eigenvectors are defined up to sign (and these eigenvalues are distinct in this seeded scatter).
                var sign = Math.Sign(Enumerable.Range(0, J).Sum(r => axes[k][r] * biplot.Axes[k][r]));
                Tolerance.Close([.. axes[k].Select(x => sign * x)], biplot.Axes[k], 1e-9, 0, $"axis {k}");
                Tolerance.Close([.. scores.Select(s => sign * s[k])], placed.Select(x => x.Scores[k]).ToArray(), 1e-9 * Math.Sqrt(scale), 1e-9, $"scores {k}");
            }
        }
    }

    [Theory]
    [InlineData(ScatterMethod.Robust)]
    [InlineData(ScatterMethod.Classical)]
    public void ScoresOverAllAxesGiveTheScreenersSquaredDistance(ScatterMethod method)
    {
        // Identity: S_clr⁺ = A Σ⁻¹ Aᵀ, so Σ_k s_k²/λ_k = (y − μ)ᵀ Σ⁻¹ (y − μ) in any coordinates of the same span.
        foreach (var map in new[] { CoordinateMaps.Pivot(J), CoordinateMaps.Alr(J), CoordinateMaps.Pairwise(J, (2, 5), (0, 4), (1, 0)) })
        {
            var baseline = Fit(map, method);
            var biplot = BaselineBiplot.Create(baseline);
            var fresh = Fresh;
            var screened = Screener.ScreenRows(baseline, fresh.Values);
            var placed = PlaceAll(biplot, fresh);
            for (var i = 0; i < placed.Length; i++)
            {
                Tolerance.Close(screened[i].SquaredDistance, placed[i].SquaredDistance, 1e-9, 1e-9, $"d² of sample {i}");
                Assert.True(placed[i].PlaneSquaredDistance <= placed[i].SquaredDistance * (1 + 1e-12));
            }
        }
    }

    [Fact]
    public void ASampleOutsideTheReferenceEllipseIsBeyondTheThreshold()
    {
        // The ellipse is the shadow of the ellipsoid d² = threshold on the plane, so outside it means d² above it.
        var baseline = Fit(CoordinateMaps.Pivot(J));
        var biplot = BaselineBiplot.Create(baseline);
        var semi = biplot.EllipseSemiAxes;
        var along1 = biplot.Place(Along(baseline, biplot.Axes[0], 1.2 * semi[0]));
        Assert.True(along1.PlaneSquaredDistance > biplot.Threshold);
        Assert.True(along1.SquaredDistance > baseline.Threshold);
        Tolerance.Close(1.2 * semi[0], along1.Scores[0], 1e-9, 1e-9, "score on axis 1");

        // Far out along axis 3: inside the ellipse on the plane, yet beyond the threshold.
        var along3 = biplot.Place(Along(baseline, biplot.Axes[2], 3 * Math.Sqrt(baseline.Threshold * biplot.Variances[2])));
        Assert.True(along3.PlaneSquaredDistance < 1e-12);
        Assert.True(along3.SquaredDistance > baseline.Threshold);

        var placed = PlaceAll(biplot, Fresh);
        Assert.All(placed, x => Tolerance.Close(
            x.PlaneSquaredDistance / biplot.Threshold,
            Math.Pow(x.Scores[0] / semi[0], 2) + Math.Pow(x.Scores[1] / semi[1], 2),
            1e-12, 1e-12, "ellipse equation"));
    }

    private static double[] Along(Baseline baseline, IReadOnlyList<double> axis, double t) =>
        [.. Enumerable.Range(0, J).Select(r => Math.Exp(baseline.ClrLocation[r] + (t * axis[r])))];

    [Fact]
    public void AxesAreOrthonormalLogContrastsWithFixedSignsAndDecreasingVariances()
    {
        var biplot = BaselineBiplot.Create(Fit(CoordinateMaps.Pivot(J)));
        Assert.Equal(J - 1, biplot.Axes.Count);
        Assert.Equal(2, biplot.Dimensions);
        for (var k = 0; k < biplot.Axes.Count; k++)
        {
            var v = biplot.Axes[k];
            Tolerance.Close(0, v.Sum(), 1e-12, 0, "Σ v");
            Assert.True(v.MaxBy(Math.Abs) > 0);
            for (var l = 0; l <= k; l++)
            {
                Tolerance.Close(k == l ? 1 : 0, Enumerable.Range(0, J).Sum(r => v[r] * biplot.Axes[l][r]), 1e-12, 0, $"v{k}·v{l}");
            }

            if (k > 0)
            {
                Assert.True(biplot.Variances[k] <= biplot.Variances[k - 1]);
            }
        }

        // Full rank: the variances add up to trace S_clr, so the explained fractions are shares of it.
        Tolerance.Close(biplot.TotalVariance, biplot.Variances.Sum(), 1e-12, 1e-12, "Σ λ");
        Assert.InRange(biplot.Explained.Sum(), 0, 1);
        Assert.Equal(J, biplot.PartCoordinates.Count);
    }

    [Fact]
    public void AOneCoordinateBaselineHasOneAxis()
    {
        var biplot = BaselineBiplot.Create(Fit(CoordinateMaps.Pairwise(J, (2, 5))));
        Assert.Equal(1, biplot.Dimensions);
        Assert.Single(biplot.EllipseSemiAxes);
        Tolerance.Close(1, biplot.Explained[0], 1e-12, 1e-12, "explained");
    }
}
