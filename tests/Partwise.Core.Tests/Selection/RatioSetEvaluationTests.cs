using Partwise.Benchmarks.Selection;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class RatioSetEvaluationTests
{
    private static readonly CompositionTable Water = SeededAmalgamations.Groundwater(5, 120);

    private static LogRatio R(string[] num, string[] den, RatioKind? kind = null) => LogRatio.Create(Water.Parts, num, den, kind, "/ratios/0");

    private static LogRatio[] MixedSet =>
    [
        R(["Na"], ["Cl"]),
        R(["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation),
        R(["HCO3"], ["SO4", "Cl"], RatioKind.Balance),
        R(["NO3"], ["HCO3"]),
        R(["Ca", "Mg", "Na"], ["HCO3"], RatioKind.Amalgamation),
    ];

    // A set whose last two ratios are combinations of the others: Na/Ca = Na/Cl − Ca/Cl, and the balance
    // g(Na)/g(Ca) is ln(Na/Ca)/√2.
    private static LogRatio[] DependentSet =>
    [
        R(["Na"], ["Cl"]),
        R(["Ca"], ["Cl"]),
        R(["Ca", "Mg"], ["K"], RatioKind.Amalgamation),
        R(["Na"], ["Ca"]),
        R(["SO4"], ["HCO3"]),
        R(["Na"], ["Ca"], RatioKind.Balance),
    ];

    // Reference: the definitions by least squares (Greenacre 2019, Math. Geosci. 51:649-682): explained by the set, by
    // each ratio alone, and the set less the set without that ratio; Procrustes by a full SVD of Z'X (Gower 1975).
    [Theory]
    [InlineData(false, false)]
    [InlineData(true, false)]
    [InlineData(false, true)]
    public void ExplainedFractionsAgreeWithLeastSquaresRefits(bool dependent, bool meanWeights)
    {
        var ratios = dependent ? DependentSet : MixedSet;
        var w = meanWeights ? SeededAmalgamations.Unequal(5, 8) : SeededAmalgamations.Equal(8);
        var result = RatioSetEvaluation.Evaluate(Water, ratios, w);
        var columns = ratios.Select(r => SelectionAssertions.Values(Water, r)).ToArray();

        var full = NaiveRatioSelection.Explained(Water, w, columns);
        Tolerance.Close(full, result.Explained, 1e-10, 0, "explained");
        Tolerance.Close(NaiveRatioSelection.Procrustes(Water, w, columns), result.Procrustes, 1e-10, 0, "procrustes");
        for (var i = 0; i < ratios.Length; i++)
        {
            Tolerance.Close(NaiveRatioSelection.Explained(Water, w, [columns[i]]), result.PerRatio[i].ExplainedAlone, 1e-10, 0, $"alone {i}");
            var without = NaiveRatioSelection.Explained(Water, w, [.. columns.Where((_, k) => k != i)]);
            Tolerance.Close(full - without, result.PerRatio[i].UniqueContribution, 1e-10, 0, $"unique {i}");
            Assert.Equal(ratios[i].Label, result.PerRatio[i].Label);
        }

        Assert.Equal(dependent ? 4 : 5, result.Rank);
        Assert.Equal("n", result.Divisor);
    }

    [Fact]
    public void RatiosThatOthersCanStandInForHaveNoUniqueContribution()
    {
        var result = RatioSetEvaluation.Evaluate(Water, DependentSet, SeededAmalgamations.Equal(8));
        // Na/Cl, Ca/Cl, Na/Ca and g(Na)/g(Ca) span two directions; any one of them can go.
        foreach (var i in new[] { 0, 1, 3, 5 })
        {
            Assert.Equal(0, result.PerRatio[i].UniqueContribution, 12);
        }

        Assert.True(result.PerRatio[2].UniqueContribution > 0);
        Assert.True(result.PerRatio[4].UniqueContribution > 0);
    }

    // Reference: tests/reference/ratio_set_reference.py (numpy.linalg.lstsq and scipy.spatial.procrustes).
    [NeedsPythonFact]
    public void EvaluationAgreesWithNumpyAndScipy()
    {
        foreach (var ratios in new[] { MixedSet, DependentSet })
        {
            var w = SeededAmalgamations.Unequal(6, 8);
            var result = RatioSetEvaluation.Evaluate(Water, ratios, w);
            var reference = PythonReference.Run(
                ReferenceFiles.Read("ratio_set_reference.py"),
                new { values = SelectionReferenceTests.Rows(Water), weights = w, ratios = ratios.Select(SelectionReferenceTests.RatioJson).ToArray() });

            Tolerance.Close(reference.GetProperty("explained").GetDouble(), result.Explained, 1e-8, 0, "explained");
            Tolerance.Close(reference.GetProperty("procrustes").EnumerateArray().Last().GetDouble(), result.Procrustes, 1e-8, 0, "procrustes");
            Tolerance.Close(reference.GetProperty("alone").EnumerateArray().Select(e => e.GetDouble()).ToArray(), result.PerRatio.Select(p => p.ExplainedAlone).ToArray(), 1e-8, 0, "alone");
            Tolerance.Close(reference.GetProperty("unique").EnumerateArray().Select(e => e.GetDouble()).ToArray(), result.PerRatio.Select(p => p.UniqueContribution).ToArray(), 1e-8, 0, "unique");
        }
    }

    // Greenacre 2019 (Math. Geosci. 51:649-682): J − 1 pairwise log-ratios forming a spanning tree (acyclic, connected)
    // explain 100% of the log-ratio variance; J − 1 ratios with a cycle leave a part out and do not.
    [Fact]
    public void ASpanningTreeExplainsEverythingAndASetWithACycleDoesNot()
    {
        string[][] tree = [["Ca", "Mg"], ["Mg", "Na"], ["Na", "K"], ["Na", "Cl"], ["Cl", "HCO3"], ["Cl", "SO4"], ["SO4", "NO3"]];
        string[][] cycle = [["Ca", "Mg"], ["Mg", "Na"], ["Na", "Ca"], ["Na", "Cl"], ["Cl", "HCO3"], ["Cl", "SO4"], ["SO4", "NO3"]];
        var treeRatios = tree.Select(p => R([p[0]], [p[1]])).ToArray();
        var cycleRatios = cycle.Select(p => R([p[0]], [p[1]])).ToArray();
        var w = SeededAmalgamations.Equal(8);

        var treeResult = RatioSetEvaluation.Evaluate(Water, treeRatios, w);
        Tolerance.Close(1.0, treeResult.Explained, 1e-12, 0, "spanning tree");
        Assert.Equal(7, treeResult.Rank);
        Assert.True(treeResult.Invertible);
        var treeGraph = RatioGraph.Build(Water.Parts, treeRatios);
        Assert.True(treeGraph.Acyclic && treeGraph.Connected);

        var cycleResult = RatioSetEvaluation.Evaluate(Water, cycleRatios, w);
        Assert.True(cycleResult.Explained < 1 - 1e-3);
        Assert.Equal(6, cycleResult.Rank);
        Assert.False(cycleResult.Invertible);
        Assert.False(RatioGraph.Build(Water.Parts, cycleRatios).Acyclic);
    }

    [Fact]
    public void AnEmptySetIsInvalidInputAtRatios()
    {
        var ex = Assert.Throws<CompositionException>(() => RatioSetEvaluation.Evaluate(Water, [], SeededAmalgamations.Equal(8)));
        Assert.Equal(ProblemTypes.InvalidInput, ex.ProblemType);
        Assert.Equal("/ratios", ex.Errors[0].Pointer);
    }

    [Fact]
    public void AZeroCellIsAZeroValueAtItsRowAndColumn()
    {
        var values = (double[])Water.Values.Clone();
        values[(2 * 8) + 1] = 0;
        var ex = Assert.Throws<CompositionException>(() => RatioSetEvaluation.Evaluate(CompositionTable.FromValues(Water.Parts, values), MixedSet, SeededAmalgamations.Equal(8)));
        Assert.Equal(ProblemTypes.ZeroValue, ex.ProblemType);
        Assert.Equal("/rows/2/1", ex.Errors[0].Pointer);
    }

    [Fact]
    public void ProportionalCompositionsHaveNoVariationToExplain()
    {
        var values = new double[10 * 8];
        for (var i = 0; i < 10; i++)
        {
            for (var j = 0; j < 8; j++)
            {
                values[(i * 8) + j] = (1 + i) * Water.Row(3)[j];
            }
        }

        var ex = Assert.Throws<CompositionException>(() => RatioSetEvaluation.Evaluate(CompositionTable.FromValues(Water.Parts, values), MixedSet, SeededAmalgamations.Equal(8)));
        Assert.Equal(ProblemTypes.NoVariation, ex.ProblemType);
    }
}
