using Partwise.Core.Problems;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class MomentsTests
{
    private static readonly CompositionTable Table = SeededAmalgamations.Structured(91, 120, 6);
    private static readonly IReadOnlyList<NamedAmalgamation> Amalgamations = SeededAmalgamations.Amalgamations(91, 6, 2);

    internal static void SamePath(RatioSelectionResult expected, RatioSelectionResult actual, double tolerance)
    {
        Assert.Equal(expected.Steps.Select(s => s.Label), actual.Steps.Select(s => s.Label));
        Tolerance.Close(expected.Steps.Select(s => s.Explained).ToArray(), actual.Steps.Select(s => s.Explained).ToArray(), tolerance, 0, "explained");
        Tolerance.Close(expected.Steps.Select(s => s.Procrustes).ToArray(), actual.Steps.Select(s => s.Procrustes).ToArray(), tolerance, 0, "procrustes");
        Tolerance.Close(expected.TotalVariance, actual.TotalVariance, 1e-14, 1e-10, "total variance (divisor n)");
        Assert.Equal(expected.Invertible, actual.Invertible);
    }

    // The sample covariance with divisor n − 1, computed directly, as the contract's moments are defined (API.md).
    internal static double[][] Covariance(CompositionTable table, IReadOnlyList<NamedAmalgamation> amalgamations)
    {
        var named = SeededAmalgamations.Indices(table, amalgamations);
        var n = table.RowCount;
        var m = table.PartCount + named.Length;
        var cols = new double[m][];
        for (var c = 0; c < m; c++)
        {
            cols[c] = [.. Enumerable.Range(0, n).Select(i => c < table.PartCount ? Math.Log(table.Row(i)[c]) : Math.Log(named[c - table.PartCount].Sum(p => table.Row(i)[p])))];
        }

        var cov = new double[m][];
        for (var a = 0; a < m; a++)
        {
            cov[a] = new double[m];
            for (var b = 0; b < m; b++)
            {
                double ma = cols[a].Average(), mb = cols[b].Average();
                cov[a][b] = Enumerable.Range(0, n).Sum(i => (cols[a][i] - ma) * (cols[b][i] - mb)) / (n - 1);
            }
        }

        return cov;
    }

    private static SelectionMoments Moments(double[][]? covariance = null, string[]? names = null, long count = 120) =>
        new(names ?? [.. Table.Parts, .. Amalgamations.Select(a => a.Name)], covariance ?? Covariance(Table, Amalgamations), count);

    private static void Fails(SelectionMoments moments, string type, string pointer, RatioSelectionOptions? options = null)
    {
        var ex = Assert.Throws<CompositionException>(() => RatioSelection.Run(moments, SeededAmalgamations.Equal(6), options ?? new RatioSelectionOptions { Amalgamations = Amalgamations }));
        Assert.Equal(type, ex.ProblemType);
        Assert.Contains(ex.Errors, e => e.Pointer == pointer);
    }

    [Fact]
    public void MomentsGiveTheSamePathAsTheTable()
    {
        var options = new RatioSelectionOptions { Amalgamations = Amalgamations, Force = [new(["p0"], ["p5"]), new(["p1", "p2"], ["p4"], Ratios.RatioKind.Balance)] };
        var w = SeededAmalgamations.Unequal(91, 6);
        SamePath(RatioSelection.Run(Table, w, options), RatioSelection.Run(Moments(), w, options), 1e-10);
    }

    [Fact]
    public void NamesThatAreNotThePartsThenTheAmalgamationsAreInvalidMoments()
    {
        Fails(Moments(names: ["p0", "p1", "p2", "p3", "p4", "p5", Amalgamations[1].Name, Amalgamations[0].Name]), ProblemTypes.InvalidMoments, "/moments/names/6");
        Fails(Moments(names: ["p0", "p0", "p2", "p3", "p4", "p5", Amalgamations[0].Name, Amalgamations[1].Name]), ProblemTypes.InvalidMoments, "/moments/names/1");
        Fails(Moments(names: ["p0", Amalgamations[0].Name, Amalgamations[1].Name], covariance: [[1, 0, 0], [0, 1, 0], [0, 0, 1]]), ProblemTypes.InvalidMoments, "/moments/names");
    }

    [Fact]
    public void AnAsymmetricCovarianceIsInvalidMoments()
    {
        var cov = Covariance(Table, Amalgamations);
        cov[1][3] += 1e-3;
        Fails(Moments(cov), ProblemTypes.InvalidMoments, "/moments/covariance");
    }

    [Fact]
    public void ACovarianceWithANegativeEigenvalueIsInvalidMoments()
    {
        var cov = Covariance(Table, Amalgamations);
        cov[2][2] -= 2 * cov[2][2]; // a negative variance
        Fails(Moments(cov), ProblemTypes.InvalidMoments, "/moments/covariance");
    }

    [Fact]
    public void ACovarianceOfTheWrongShapeOrWithNonFiniteValuesIsRefusedAtItsPointer()
    {
        var cov = Covariance(Table, Amalgamations);
        Fails(Moments([.. cov.Take(7)]), ProblemTypes.InvalidMoments, "/moments/covariance");
        cov[3] = [.. cov[3].Take(5)];
        Fails(Moments(cov), ProblemTypes.InvalidMoments, "/moments/covariance/3");
        var nan = Covariance(Table, Amalgamations);
        nan[4][0] = double.NaN;
        Fails(Moments(nan), ProblemTypes.NonFiniteValue, "/moments/covariance/4/0");
    }

    [Fact]
    public void ACountBelowTwoIsInvalidMoments() =>
        Fails(Moments(count: 1), ProblemTypes.InvalidMoments, "/moments/count");

    [Fact]
    public void AForcedSumThatTheMomentsDoNotHoldIsAnInvalidRatio() =>
        Fails(
            Moments(),
            ProblemTypes.InvalidRatio,
            "/force/0",
            new RatioSelectionOptions { Amalgamations = Amalgamations, Force = [new(["p0", "p1", "p2"], ["p3", "p4", "p5"], Ratios.RatioKind.Amalgamation)] });

    [Fact]
    public void TheSameCovarianceFromMoreSamplesGivesTheSamePath()
    {
        // The same covariance from 120 or 120,000 samples gives the same path; only the conversion of TV to divisor n differs.
        var small = RatioSelection.Run(Moments(count: 120), SeededAmalgamations.Equal(6), new RatioSelectionOptions { Amalgamations = Amalgamations });
        var large = RatioSelection.Run(Moments(count: 120_000), SeededAmalgamations.Equal(6), new RatioSelectionOptions { Amalgamations = Amalgamations });
        Assert.Equal(small.Steps.Select(s => s.Label), large.Steps.Select(s => s.Label));
        Tolerance.Close(small.TotalVariance * 120 / 119 * 119_999 / 120_000, large.TotalVariance, 1e-15, 1e-12, "TV");
    }
}
