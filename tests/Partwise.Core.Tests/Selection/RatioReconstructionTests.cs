using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class RatioReconstructionTests
{
    private static readonly string[] Ions = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3"];

    private static LogRatio R(IReadOnlyList<string> parts, string[] num, string[] den, RatioKind? kind = null) => LogRatio.Create(parts, num, den, kind, "/ratios/0");

    private static double[][] Forward(CompositionTable table, IReadOnlyList<LogRatio> ratios) =>
        [.. Enumerable.Range(0, table.RowCount).Select(i => ratios.Select(r => r.Evaluate(table.Row(i))).ToArray())];

    private static void RecoversTheClosedCompositions(CompositionTable table, IReadOnlyList<LogRatio> ratios, double total)
    {
        var solved = RatioReconstruction.Solve(table.Parts, ratios, Forward(table, ratios), total);
        Assert.Equal(table.RowCount, solved.RowCount);
        for (var i = 0; i < table.RowCount; i++)
        {
            var row = table.Row(i);
            var sum = 0.0;
            foreach (var v in row)
            {
                sum += v;
            }

            for (var j = 0; j < table.PartCount; j++)
            {
                Tolerance.Close(total * row[j] / sum, solved.Row(i)[j], 1e-300, 1e-11, $"row {i} part {j}");
            }
        }
    }

    // Greenacre 2020 (Applied Computing and Geosciences 5:100017) and METHODS.md "Back-transform from ratio values": a
    // complete set of J − 1 ratios determines the closed composition; here seeded random spanning trees of pairwise ratios.
    [Theory]
    [InlineData(1, 4)]
    [InlineData(2, 8)]
    [InlineData(3, 25)]
    public void PairwiseSpanningTreesInvertTheirForwardValues(int seed, int parts)
    {
        var table = SeededCompositions.Table(seed, 30, parts, sigma: 2.0);
        var random = new Random(seed);
        var order = Enumerable.Range(0, parts).OrderBy(_ => random.Next()).ToArray();
        var ratios = Enumerable.Range(1, parts - 1).Select(k =>
        {
            var other = order[random.Next(k)];
            return random.Next(2) == 0
                ? LogRatio.FromIndices(table.Parts, [order[k]], [other], null, "")
                : LogRatio.FromIndices(table.Parts, [other], [order[k]], null, "");
        }).ToArray();

        Assert.True(RatioReconstruction.IsInvertible(table.Parts, ratios));
        RecoversTheClosedCompositions(table, ratios, 1.0);
    }

    [Fact]
    public void AmalgamationAndPairwiseRatiosInvertTheirForwardValues()
    {
        var table = SeededAmalgamations.Groundwater(9, 40);
        LogRatio[] ratios =
        [
            R(Ions, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation),
            R(Ions, ["Ca"], ["Mg"]),
            R(Ions, ["Na"], ["K"]),
            R(Ions, ["Cl", "SO4", "NO3"], ["HCO3"], RatioKind.Amalgamation),
            R(Ions, ["Cl"], ["SO4"]),
            R(Ions, ["SO4"], ["NO3"]),
            R(Ions, ["HCO3"], ["Ca", "Mg", "Na", "K"], RatioKind.Amalgamation),
        ];

        Assert.True(RatioReconstruction.IsInvertible(Ions, ratios));
        RecoversTheClosedCompositions(table, ratios, 100.0);
    }

    [Fact]
    public void BalancesOfASequentialBinaryPartitionInvertTheirForwardValues()
    {
        // Egozcue & Pawlowsky-Glahn 2005 (Math. Geol. 37:795-828): the J − 1 balances of a sequential binary partition
        // are an orthonormal basis, so they determine the composition; mixed here with a pairwise ratio.
        var table = SeededAmalgamations.Groundwater(10, 25);
        LogRatio[] ratios =
        [
            R(Ions, ["Ca", "Mg", "Na", "K"], ["HCO3", "Cl", "SO4", "NO3"], RatioKind.Balance),
            R(Ions, ["Ca", "Mg"], ["Na", "K"], RatioKind.Balance),
            R(Ions, ["Ca"], ["Mg"]),
            R(Ions, ["Na"], ["K"], RatioKind.Balance),
            R(Ions, ["HCO3"], ["Cl", "SO4", "NO3"], RatioKind.Balance),
            R(Ions, ["Cl"], ["SO4", "NO3"], RatioKind.Balance),
            R(Ions, ["SO4"], ["NO3"], RatioKind.Balance),
        ];

        Assert.True(RatioReconstruction.IsInvertible(Ions, ratios));
        RecoversTheClosedCompositions(table, ratios, 1e6);
    }

    [Fact]
    public void ASelectedInvertibleSetWithAmalgamationsRoundTrips()
    {
        var table = SeededAmalgamations.Groundwater(11, 80);
        var selection = RatioSelection.Run(table, SeededAmalgamations.Equal(8), new RatioSelectionOptions { Amalgamations = SeededAmalgamations.GroundwaterAmalgamations });
        Assert.True(selection.Invertible);
        RecoversTheClosedCompositions(table, [.. selection.Steps.Select(s => s.Ratio)], 1.0);
    }

    [Fact]
    public void IsInvertibleTellsSpanningTreesFromSetsWithACycleOrTooFewRatios()
    {
        string[] parts = ["a", "b", "c", "d"];
        Assert.True(RatioReconstruction.IsInvertible(parts, [R(parts, ["a"], ["b"]), R(parts, ["c"], ["b"]), R(parts, ["d"], ["a"])]));
        Assert.False(RatioReconstruction.IsInvertible(parts, [R(parts, ["a"], ["b"]), R(parts, ["b"], ["c"]), R(parts, ["c"], ["a"])]));
        Assert.False(RatioReconstruction.IsInvertible(parts, [R(parts, ["a"], ["b"]), R(parts, ["c"], ["d"])]));
        // (a+b)/c, a/b and c/d determine everything; (a+b)/(c+d), a/b, c/d too; (a+b)/(c+d) with (a+b)/c and (a+b)/d not:
        // ln((a+b)/(c+d)) is a function of the other two.
        Assert.True(RatioReconstruction.IsInvertible(parts, [R(parts, ["a", "b"], ["c"], RatioKind.Amalgamation), R(parts, ["a"], ["b"]), R(parts, ["c"], ["d"])]));
        Assert.False(RatioReconstruction.IsInvertible(parts, [
            R(parts, ["a", "b"], ["c", "d"], RatioKind.Amalgamation),
            R(parts, ["a", "b"], ["c"], RatioKind.Amalgamation),
            R(parts, ["a", "b"], ["d"], RatioKind.Amalgamation)]));
    }

    private static void Fails(Action action, string type, string pointer)
    {
        var ex = Assert.Throws<CompositionException>(action);
        Assert.Equal(type, ex.ProblemType);
        Assert.Contains(ex.Errors, e => e.Pointer == pointer);
    }

    [Fact]
    public void TooFewOrTooManyRatiosAreASingularRatioSet()
    {
        string[] parts = ["a", "b", "c"];
        Fails(() => RatioReconstruction.Solve(parts, [R(parts, ["a"], ["b"])], [[0.1]]), ProblemTypes.SingularRatioSet, "/ratios");
        Fails(() => RatioReconstruction.Solve(parts, [R(parts, ["a"], ["b"]), R(parts, ["b"], ["c"]), R(parts, ["a"], ["c"])], [[0.1, 0.2, 0.3]]), ProblemTypes.SingularRatioSet, "/ratios");
    }

    [Fact]
    public void ASetWithACycleIsASingularRatioSetThatNamesTheUnconnectedGroups()
    {
        string[] parts = ["a", "b", "c", "d"];
        var ex = Assert.Throws<CompositionException>(() => RatioReconstruction.Solve(parts, [R(parts, ["a"], ["b"]), R(parts, ["b"], ["c"]), R(parts, ["c"], ["a"])], [[0.1, 0.2, -0.3]]));
        Assert.Equal(ProblemTypes.SingularRatioSet, ex.ProblemType);
        Assert.Equal("/ratios", ex.Errors[0].Pointer);
        Assert.Contains("{a, b, c} {d}", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void BalancesWithAmalgamationsAreAnUnsupportedRatioSetAtTheBalance()
    {
        string[] parts = ["a", "b", "c"];
        Fails(
            () => RatioReconstruction.Solve(parts, [R(parts, ["a", "b"], ["c"], RatioKind.Amalgamation), R(parts, ["a"], ["b"], RatioKind.Balance)], [[0.1, 0.2]]),
            ProblemTypes.UnsupportedRatioSet,
            "/ratios/1");
    }

    [Fact]
    public void ValuesThatNoCompositionHasAreInfeasibleAtTheirRow()
    {
        // (a+b)/c = 1 with a/c = e^0.5 > 1 would need b < 0.
        string[] parts = ["a", "b", "c"];
        LogRatio[] ratios = [R(parts, ["a", "b"], ["c"], RatioKind.Amalgamation), R(parts, ["a"], ["c"])];
        Fails(() => RatioReconstruction.Solve(parts, ratios, [[0.0, -0.5], [0.0, 0.5]]), ProblemTypes.InfeasibleRatioValues, "/rows/1");
    }

    [Fact]
    public void ValuesThatMakeTheEquationsSingularAreASingularRatioSetAtTheSetAndTheRow()
    {
        // Row 0 comes from the composition (1, 2, 3, 4). Row 1: values at which this generically invertible set's equations
        // are singular (found in numpy by a sign change of the determinant along a line; condition number about 4e16).
        string[] parts = ["x0", "x1", "x2", "x3"];
        LogRatio[] ratios =
        [
            R(parts, ["x2", "x3"], ["x0"], RatioKind.Amalgamation),
            R(parts, ["x0"], ["x1", "x2"], RatioKind.Amalgamation),
            R(parts, ["x0", "x3"], ["x1"], RatioKind.Amalgamation),
        ];
        Assert.True(RatioReconstruction.IsInvertible(parts, ratios));
        var ex = Assert.Throws<CompositionException>(() => RatioReconstruction.Solve(parts, ratios, [[Math.Log(7), Math.Log(0.2), Math.Log(2.5)], [0.09206759684044125, -1.3600829518368043, 0.6198427915659515]]));
        Assert.Equal(ProblemTypes.SingularRatioSet, ex.ProblemType);
        Assert.Contains(ex.Errors, e => e.Pointer == "/ratios");
        Assert.Contains(ex.Errors, e => e.Pointer == "/rows/1");
    }

    [Fact]
    public void NonFiniteValuesArePointedAtTheirCell()
    {
        string[] parts = ["a", "b", "c"];
        LogRatio[] ratios = [R(parts, ["a"], ["b"]), R(parts, ["b"], ["c"])];
        Fails(() => RatioReconstruction.Solve(parts, ratios, [[0.1, 0.2], [double.NaN, 0.2]]), ProblemTypes.NonFiniteValue, "/rows/1/0");
        Fails(() => RatioReconstruction.Solve(parts, ratios, [[0.1, double.PositiveInfinity]]), ProblemTypes.NonFiniteValue, "/rows/0/1");
    }

    [Fact]
    public void RowsOfTheWrongLengthATotalThatIsNotPositiveOrASinglePartAreRefused()
    {
        string[] parts = ["a", "b", "c"];
        LogRatio[] ratios = [R(parts, ["a"], ["b"]), R(parts, ["b"], ["c"])];
        Fails(() => RatioReconstruction.Solve(parts, ratios, [[0.1, 0.2], [0.3]]), ProblemTypes.InvalidInput, "/rows/1");
        Fails(() => RatioReconstruction.Solve(parts, ratios, []), ProblemTypes.InvalidInput, "/rows");
        Fails(() => RatioReconstruction.Solve(parts, ratios, [[0.1, 0.2]], total: 0), ProblemTypes.InvalidOption, "/total");
        Fails(() => RatioReconstruction.Solve(["a"], [], [[]]), ProblemTypes.InvalidInput, "/parts");
    }

    [Fact]
    public void ExtremeButFeasibleValuesStillInvert()
    {
        // Parts spanning e^±40 relative to each other, through the amalgamation system (scaled rows avoid overflow).
        string[] parts = ["a", "b", "c"];
        LogRatio[] ratios = [R(parts, ["a"], ["b"]), R(parts, ["a", "b"], ["c"], RatioKind.Amalgamation)];
        var solved = RatioReconstruction.Solve(parts, ratios, [[40, -40]]);
        var row = solved.Row(0);
        Tolerance.Close(40, Math.Log(row[0] / row[1]), 1e-12, 1e-12, "ln(a/b)");
        Tolerance.Close(-40, Math.Log((row[0] + row[1]) / row[2]), 1e-12, 1e-12, "ln((a+b)/c)");
    }
}
