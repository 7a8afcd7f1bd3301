using Partwise.Core.Problems;
using Partwise.Core.Ratios;

namespace Partwise.Core.Tests.Transforms;

public class LogRatioValidationTests
{
    private static readonly string[] Parts = ["Ca", "Mg", "Na", "K"];

    [Fact]
    public void OverlappingNumeratorAndDenominatorIsRefused()
    {
        var ex = Assert.Throws<CompositionException>(() => LogRatio.Create(Parts, ["Ca", "Mg"], ["Mg", "K"], RatioKind.Amalgamation, "/ratios/1"));
        Assert.Equal(ProblemTypes.InvalidRatio, ex.ProblemType);
        Assert.Equal("/ratios/1", ex.Errors[0].Pointer);
    }

    [Fact]
    public void SeveralPartsOnASideWithoutKindIsRefused()
    {
        var ex = Assert.Throws<CompositionException>(() => LogRatio.Create(Parts, ["Ca", "Mg"], ["Na"], null, "/ratios/0"));
        Assert.Equal("/ratios/0/kind", ex.Errors[0].Pointer);
    }

    [Fact]
    public void UnknownPartPointsAtItsName()
    {
        var ex = Assert.Throws<CompositionException>(() => LogRatio.Create(Parts, ["Ca"], ["Cl"], null, "/ratios/3"));
        Assert.Equal(ProblemTypes.UnknownPart, ex.ProblemType);
        Assert.Equal("/ratios/3/den/0", ex.Errors[0].Pointer);
    }

    [Fact]
    public void NamedAmalgamationsLabelWithTheirNames()
    {
        var r = LogRatio.Create(Parts, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation, "/ratios/0", "hardness", "alkalis");
        Assert.Equal("hardness/alkalis", r.Label);
        var mixed = LogRatio.Create(Parts, ["Ca", "Mg"], ["Na"], RatioKind.Amalgamation, "/ratios/0");
        Assert.Equal("(Ca+Mg)/Na", mixed.Label);
    }

    [Fact]
    public void BalanceLogContrastIsOrthogonalToOnesWithUnitNorm()
    {
        // Balance coefficients +√(s/(r(r+s))), −√(r/(s(r+s))) (Egozcue & Pawlowsky-Glahn 2005): Σ a = 0, ‖a‖ = 1.
        var a = LogRatio.Create(Parts, ["Ca", "Mg", "Na"], ["K"], RatioKind.Balance, "/r").LogContrast(4)!;
        Assert.Equal(0, a.Sum(), 12);
        Assert.Equal(1, a.Sum(v => v * v), 12);
    }

    [Theory]
    [InlineData(44.9, 1e-320)]
    [InlineData(1e-320, 44.9)]
    [InlineData(1e308, 1e-10)]
    [InlineData(4.9e-324, 1e308)]
    public void ALogRatioOfExtremeButPositiveValuesIsFinite(double a, double b)
    {
        // The quotient a / b overflows or underflows a double; ln a − ln b does not (identity ln(a/b) = ln a − ln b).
        var pairwise = LogRatio.Create(Parts, ["Ca"], ["Mg"], null, "/ratios/0");
        var amalgamation = LogRatio.Create(Parts, ["Ca", "Na"], ["Mg", "K"], RatioKind.Amalgamation, "/ratios/1");
        double[] row = [a, b, 0, 0];
        Assert.Equal(Math.Log(a) - Math.Log(b), pairwise.Evaluate(row), 1e-9);
        Assert.Equal(Math.Log(a) - Math.Log(b), amalgamation.Evaluate(row), 1e-9);
    }
}
