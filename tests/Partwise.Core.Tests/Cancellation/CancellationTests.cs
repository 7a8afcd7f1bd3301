using Partwise.Core.Analysis;
using Partwise.Core.Ratios;
using Partwise.Core.Screening;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;
using Partwise.Core.Transforms;
using Partwise.Core.Variance;

namespace Partwise.Core.Tests.Cancellation;

/// <summary>
/// Every long loop of the math library looks at its caller's token: with a cancelled token each entry point (and each
/// inner loop that can run long on its own) throws <see cref="OperationCanceledException"/> instead of computing, and
/// with a live token it gives the same result as without one.
/// </summary>
public class CancellationTests
{
    private static readonly CompositionTable Table = SeededCompositions.Table(20261202, 40, 5);

    private static readonly double[] Equal = [0.2, 0.2, 0.2, 0.2, 0.2];

    public static TheoryData<string> Loops() =>
    [
        "clr", "clr inverse", "alr", "alr inverse", "ilr", "ilr inverse", "pairwise", "ratio set", "distances", "summary",
        "lra", "selection on a table", "selection on moments", "selection gram", "selection residual gram",
        "ratio set evaluation", "reconstruction in logs", "reconstruction in parts", "robust scatter (FAST-MCD)",
        "nested FAST-MCD", "robust baseline fit",
    ];

    [Theory]
    [MemberData(nameof(Loops))]
    public void ACancelledTokenStopsTheLoop(string loop)
    {
        using var source = new CancellationTokenSource();
        source.Cancel();
        Assert.ThrowsAny<OperationCanceledException>(() => Run(loop, source.Token));
    }

    [Theory]
    [MemberData(nameof(Loops))]
    public void ALiveTokenChangesNothing(string loop)
    {
        using var source = new CancellationTokenSource();
        Assert.Equal(Run(loop, CancellationToken.None), Run(loop, source.Token));
    }

    // Each loop's result reduced to its numbers, so runs with and without a token can be compared exactly.
    private static double[] Run(string loop, CancellationToken token)
    {
        var parts = Table.Parts;
        var basis = PivotBasis.Create(parts);
        var pairs = new[] { (0, 4), (1, 4), (2, 4), (3, 4) }.Select(p => LogRatio.FromIndices(parts, [p.Item1], [p.Item2], RatioKind.Pairwise, "")).ToArray();
        var amalgamated = new[]
        {
            LogRatio.FromIndices(parts, [0, 1], [4], RatioKind.Amalgamation, ""),
            LogRatio.FromIndices(parts, [1], [4], RatioKind.Pairwise, ""),
            LogRatio.FromIndices(parts, [2], [4], RatioKind.Pairwise, ""),
            LogRatio.FromIndices(parts, [3], [4], RatioKind.Pairwise, ""),
        };
        var logRows = Enumerable.Range(0, Table.RowCount).Select(i => new[] { 0.1 * i, -0.2, 0.3, 0.05 }).ToArray();
        switch (loop)
        {
            case "clr":
                return Clr.Forward(Table, null, token).Values;
            case "clr inverse":
                return Clr.Inverse(parts, Clr.Forward(Table).Values, 1, null, token).Values;
            case "alr":
                return Alr.Forward(Table, 4, token).Values;
            case "alr inverse":
                return Alr.Inverse(parts, 4, Alr.Forward(Table, 4).Values, 1, null, token).Values;
            case "ilr":
                return Ilr.Forward(Table, basis, token).Values;
            case "ilr inverse":
                return Ilr.Inverse(basis, Ilr.Forward(Table, basis).Values, 1, null, token).Values;
            case "pairwise":
                return PairwiseLogRatios.Forward(Table, token).Values;
            case "ratio set":
                return RatioSetTransform.Forward(Table, pairs, token).Values;
            case "distances":
                return AitchisonDistance.Matrix(Table, token);
            case "summary":
                return CompositionSummary.Compute(Table, Equal, token).ClrCovariance;
            case "lra":
                return [.. LogRatioAnalysis.Run(Table, PartWeightSpec.Equal, 2, token).SingularValues];
            case "selection on a table":
                return [.. RatioSelection.Run(Table, Equal, new RatioSelectionOptions(), token).Steps.Select(s => s.Explained)];
            case "selection on moments":
                return [.. RatioSelection.Run(Moments(), Equal, new RatioSelectionOptions(), token).Steps.Select(s => s.Explained)];
            case "selection gram":
                return AugmentedGram.Compute(Table, [], token);
            case "selection residual gram":
                return new ResidualGram(AugmentedGram.Compute(Table, []), 5, Equal, token).N;
            case "ratio set evaluation":
                return [RatioSetEvaluation.Evaluate(Table, pairs, Equal, token).Explained];
            case "reconstruction in logs":
                return RatioReconstruction.Solve(parts, pairs, logRows, 1, token).Values;
            case "reconstruction in parts":
                return RatioReconstruction.Solve(parts, amalgamated, logRows, 1, token).Values;
            case "robust scatter (FAST-MCD)":
                return RobustScatter.Fit(Ilr.Forward(Table, basis).Values, 4, cancellationToken: token).Covariance.ToArray();
            case "nested FAST-MCD":
                // Over 600 rows the search runs in nested subsets: their trials look at the token too.
                var large = SeededCompositions.Table(7, 700, 3);
                return RobustScatter.Fit(Ilr.Forward(large, PivotBasis.Create(large.Parts)).Values, 2, cancellationToken: token).Covariance.ToArray();
            case "robust baseline fit":
                var map = basis.Coefficients;
                return BaselineFit.Fit(parts, map, Ilr.Forward(Table, basis).Values, null, null, token).Baseline.LocationArray;
            default:
                throw new ArgumentOutOfRangeException(nameof(loop), loop, "No such loop.");
        }
    }

    // The sample covariance (divisor n − 1) of the logs of the parts, as a distributed engine would send it.
    private static SelectionMoments Moments()
    {
        int n = Table.RowCount, j = Table.PartCount;
        var logs = Table.Values.Select(v => Math.Log(v)).ToArray();
        var mean = new double[j];
        for (var i = 0; i < n; i++)
        {
            for (var k = 0; k < j; k++)
            {
                mean[k] += logs[(i * j) + k] / n;
            }
        }

        var covariance = new double[j][];
        for (var a = 0; a < j; a++)
        {
            covariance[a] = new double[j];
            for (var b = 0; b < j; b++)
            {
                var s = 0.0;
                for (var i = 0; i < n; i++)
                {
                    s += (logs[(i * j) + a] - mean[a]) * (logs[(i * j) + b] - mean[b]);
                }

                covariance[a][b] = s / (n - 1);
            }
        }

        return new SelectionMoments(Table.Parts, covariance, n);
    }
}
