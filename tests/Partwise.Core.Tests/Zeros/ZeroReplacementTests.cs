using Partwise.Core.Problems;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;
using Partwise.Core.Zeros;

namespace Partwise.Core.Tests.Zeros;

public class ZeroReplacementTests
{
    private static readonly string[] Parts = ["a", "b", "c"];

    [Fact]
    public void ZeroUnderRejectPolicyPointsAtEveryZeroCell()
    {
        var table = CompositionTable.FromRows(Parts, [[1, 2, 3], [0, 2, 3], [1, 0, 0]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, ZeroPolicy.Reject));
        Assert.Equal(ProblemTypes.ZeroValue, ex.ProblemType);
        Assert.Equal(["/rows/1/0", "/rows/2/1", "/rows/2/2"], ex.Errors.Select(e => e.Pointer));
    }

    [Fact]
    public void MultiplicativeReplacementWorkedExample()
    {
        // Martín-Fernández et al. 2003, eq. 4: row (0, 2, 8), c = 10, DL = 1, f = 0.65: δ = 0.65 and the
        // other parts × (1 − 0.65/10) = 0.935, giving (0.65, 1.87, 7.48), which still sums to 10.
        var table = CompositionTable.FromRows(Parts, [[0, 2, 8]]);
        var result = ZeroReplacement.Apply(table, new MultiplicativeReplacement(1.0, null));
        Tolerance.Close([0.65, 1.87, 7.48], result.Table.Values, 1e-14);
        var cell = Assert.Single(result.Imputed);
        Assert.Equal((0, "a"), (cell.Row, cell.Part));
        Tolerance.Close(0.65, cell.Value);
    }

    [Fact]
    public void MultiplicativeReplacementUsesLimitsPerPartAndTheFraction()
    {
        // Same formula: limits NO3 0.2, fraction 0.5 → δ = 0.1; the others × (1 − 0.1/4) = 0.975.
        var table = CompositionTable.FromRows(["Cl", "NO3"], [[4, 0]]);
        var result = ZeroReplacement.Apply(table, new MultiplicativeReplacement(null, new Dictionary<string, double> { ["NO3"] = 0.2 }, 0.5));
        Tolerance.Close([3.9, 0.1], result.Table.Values, 1e-14);
    }

    [Fact]
    public void MultiplicativeReplacementWithoutALimitForTheZeroPartPointsAtTheCell()
    {
        var table = CompositionTable.FromRows(["Cl", "NO3", "K"], [[4, 1, 0]]);
        var ex = Assert.Throws<CompositionException>(() =>
            ZeroReplacement.Apply(table, new MultiplicativeReplacement(null, new Dictionary<string, double> { ["NO3"] = 0.2 })));
        Assert.Equal(ProblemTypes.InvalidZeroPolicy, ex.ProblemType);
        Assert.Equal("/rows/0/2", ex.Errors[0].Pointer);
    }

    [Fact]
    public void DetectionLimitForAnUnknownPartIsRejected()
    {
        var table = CompositionTable.FromRows(["Cl", "NO3"], [[4, 0]]);
        var ex = Assert.Throws<CompositionException>(() =>
            ZeroReplacement.Apply(table, new MultiplicativeReplacement(null, new Dictionary<string, double> { ["F"] = 0.2 })));
        Assert.Equal(ProblemTypes.UnknownPart, ex.ProblemType);
        Assert.Equal("/zeros/detectionLimits/F", ex.Errors[0].Pointer);
    }

    [Theory]
    [InlineData(CountPrior.Perks, 1.0)]
    [InlineData(CountPrior.BayesLaplace, 3.0)]
    [InlineData(CountPrior.Jeffreys, 1.5)]
    [InlineData(CountPrior.SquareRoot, 3.1622776601683795)]
    public void BayesianMultiplicativeWorkedExample(CountPrior prior, double strength)
    {
        // Martín-Fernández et al. 2015, §3: counts (0, 3, 7), N = 10, t = 1/3, s by prior (s = √10 for square
        // root). Zero share r = t s / (N + s); the others (n_j / N)(1 − r); returned × N.
        var table = CompositionTable.FromRows(Parts, [[0, 3, 7]]);
        var result = ZeroReplacement.Apply(table, new BayesianMultiplicativeReplacement(prior));
        var r = strength / 3 / (10 + strength);
        Tolerance.Close([10 * r, 3 * (1 - r), 7 * (1 - r)], result.Table.Values, 1e-13);
        Assert.Single(result.Imputed);
    }

    [Fact]
    public void BayesianMultiplicativeRefusesNonIntegerValues()
    {
        var table = CompositionTable.FromRows(Parts, [[0, 3, 7], [1.5, 2, 3]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, new BayesianMultiplicativeReplacement(CountPrior.Perks)));
        Assert.Equal(ProblemTypes.InvalidZeroPolicy, ex.ProblemType);
        Assert.Equal("/rows/1/0", ex.Errors[0].Pointer);
    }

    [Fact]
    public void AllZeroRowIsAZeroProblemPointingAtTheRow()
    {
        var table = CompositionTable.FromRows(Parts, [[1, 2, 3], [0, 0, 0]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, new MultiplicativeReplacement(0.1, null)));
        Assert.Equal("/rows/1", ex.Errors[0].Pointer);
    }

    [Fact]
    public void ReplacementsThatUseUpTheRowAreRefused()
    {
        var table = CompositionTable.FromRows(Parts, [[0, 0.1, 0.1]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, new MultiplicativeReplacement(1.0, null)));
        Assert.Equal("/rows/0", ex.Errors[0].Pointer);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(1.5)]
    [InlineData(double.NaN)]
    public void FractionOutsideZeroOneIsRefused(double fraction)
    {
        var table = CompositionTable.FromRows(Parts, [[0, 1, 1]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, new MultiplicativeReplacement(1.0, null, fraction)));
        Assert.Equal("/zeros/fraction", ex.Errors[0].Pointer);
    }

    [Fact]
    public void AReplacementThatUnderflowsToZeroIsRefusedAtTheFraction()
    {
        // 4.9e-324 (the smallest positive double) × 0.05 rounds to 0: the "replaced" zero would stay a zero.
        var table = CompositionTable.FromRows(Parts, [[0, 1, 1]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, new MultiplicativeReplacement(0.05, null, 4.9e-324)));
        Assert.Equal(ProblemTypes.InvalidZeroPolicy, ex.ProblemType);
        Assert.Equal("/zeros/fraction", ex.Errors[0].Pointer);
    }

    [Fact]
    public void ASubnormalValueThatTheShrinkWouldRoundToZeroIsRefusedAtItsCell()
    {
        // Shrink 1 − 0.6/1 = 0.4 turns the smallest positive double into 0.4 of a unit in the last place: 0.
        var table = CompositionTable.FromRows(Parts, [[0, 1, 4.9e-324]]);
        var ex = Assert.Throws<CompositionException>(() => ZeroReplacement.Apply(table, new MultiplicativeReplacement(1.0, null, 0.6)));
        Assert.Equal(ProblemTypes.InvalidZeroPolicy, ex.ProblemType);
        Assert.Equal("/rows/0/2", ex.Errors[0].Pointer);
    }
}
