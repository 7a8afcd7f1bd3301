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
}
