using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class RatioSelectionProblemTests
{
    private static readonly CompositionTable Water = SeededAmalgamations.Groundwater(3, 60);
    private static readonly double[] Equal8 = SeededAmalgamations.Equal(8);

    private static CompositionException Fails(RatioSelectionOptions options, CompositionTable? table = null) =>
        Assert.Throws<CompositionException>(() => RatioSelection.Run(table ?? Water, Equal8, options));

    private static void Points(CompositionException ex, string type, string pointer)
    {
        Assert.Equal(type, ex.ProblemType);
        Assert.Contains(ex.Errors, e => e.Pointer == pointer);
    }

    [Fact]
    public void AForcedRatioThatClosesACycleIsADependentRatioAtItsPointer()
    {
        var ex = Fails(new RatioSelectionOptions { Force = [new(["Na"], ["Cl"]), new(["Cl"], ["Ca"]), new(["Na"], ["Ca"])] });
        Points(ex, ProblemTypes.DependentRatio, "/force/2");
    }

    [Fact]
    public void AForcedBalanceThatIsACombinationOfEarlierRatiosIsADependentRatio()
    {
        // g(Na,Ca)/g(Cl) = ½ ln(Na/Cl) + ½ ln(Ca/Cl), up to its factor: dependent on the first two.
        var ex = Fails(new RatioSelectionOptions { Force = [new(["Na"], ["Cl"]), new(["Ca"], ["Cl"]), new(["Na", "Ca"], ["Cl"], RatioKind.Balance)] });
        Points(ex, ProblemTypes.DependentRatio, "/force/2");
    }

    [Fact]
    public void AForcedRatioRepeatedIsADependentRatio()
    {
        var ex = Fails(new RatioSelectionOptions
        {
            Amalgamations = SeededAmalgamations.GroundwaterAmalgamations,
            Force = [new(["hardness"], ["Na"]), new(["Ca", "Mg"], ["Na"], RatioKind.Amalgamation)],
        });
        Points(ex, ProblemTypes.DependentRatio, "/force/1");
    }

    [Fact]
    public void AForcedRatioThatNeverVariesIsADependentRatio()
    {
        var values = (double[])Water.Values.Clone();
        for (var i = 0; i < Water.RowCount; i++)
        {
            values[(i * 8) + 3] = 0.5 * values[(i * 8) + 2]; // K = Na / 2 in every sample
        }

        var ex = Fails(new RatioSelectionOptions { Force = [new(["K"], ["Na"])] }, CompositionTable.FromValues(Water.Parts, values));
        Points(ex, ProblemTypes.DependentRatio, "/force/0");
    }

    [Fact]
    public void ExcludingAnUnknownPartIsAnUnknownPartAtItsIndex() =>
        Points(Fails(new RatioSelectionOptions { Exclude = ["Ca", "Fe"] }), ProblemTypes.UnknownPart, "/exclude/1");

    [Fact]
    public void ExcludingAllButOnePartIsAnInvalidOptionAtExclude() =>
        Points(Fails(new RatioSelectionOptions { Exclude = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4"] }), ProblemTypes.InvalidOption, "/exclude");

    [Fact]
    public void ForcingARatioWithAnExcludedPartIsAnInvalidOptionAtTheRatio() =>
        Points(Fails(new RatioSelectionOptions { Exclude = ["NO3"], Force = [new(["Na"], ["Cl"]), new(["NO3"], ["Cl"])] }), ProblemTypes.InvalidOption, "/force/1");

    [Theory]
    [InlineData(0.0)]
    [InlineData(-0.2)]
    [InlineData(1.5)]
    [InlineData(double.NaN)]
    public void StopExplainedOutsideZeroToOneIsAnInvalidOption(double explained) =>
        Points(Fails(new RatioSelectionOptions { Explained = explained }), ProblemTypes.InvalidOption, "/stop/explained");

    [Fact]
    public void StopExplainedOfOneIsAccepted() =>
        Assert.Equal(7, RatioSelection.Run(Water, Equal8, new RatioSelectionOptions { Explained = 1 }).Steps.Count);

    [Fact]
    public void MaxRatiosBelowOneOrBelowTheForcedCountIsAnInvalidOption()
    {
        Points(Fails(new RatioSelectionOptions { MaxRatios = 0 }), ProblemTypes.InvalidOption, "/stop/maxRatios");
        Points(Fails(new RatioSelectionOptions { MaxRatios = 1, Force = [new(["Na"], ["Cl"]), new(["Ca"], ["Cl"])] }), ProblemTypes.InvalidOption, "/stop/maxRatios");
    }

    [Fact]
    public void AmalgamationsWithUnknownOrRepeatedPartsOrClashingNamesAreRefusedAtTheirPointers()
    {
        Points(Fails(new RatioSelectionOptions { Amalgamations = [new("hardness", ["Ca", "Fe"])] }), ProblemTypes.UnknownPart, "/amalgamations/hardness/1");
        Points(Fails(new RatioSelectionOptions { Amalgamations = [new("hardness", ["Ca", "Ca"])] }), ProblemTypes.InvalidInput, "/amalgamations/hardness/1");
        Points(Fails(new RatioSelectionOptions { Amalgamations = [new("Na", ["Ca", "Mg"])] }), ProblemTypes.InvalidInput, "/amalgamations/Na");
        Points(Fails(new RatioSelectionOptions { Amalgamations = [new("hardness", ["Ca"])] }), ProblemTypes.InvalidInput, "/amalgamations/hardness");
        Points(Fails(new RatioSelectionOptions { Amalgamations = [new("a/b", ["Ca", "Mg"]), new("a/b", ["Na", "K"])] }), ProblemTypes.InvalidInput, "/amalgamations/a~1b");
    }

    [Fact]
    public void ForcedRatiosWithUnknownPartsOrMisusedAmalgamationNamesAreRefusedAtTheirPointers()
    {
        var amalgamations = SeededAmalgamations.GroundwaterAmalgamations;
        Points(Fails(new RatioSelectionOptions { Force = [new(["Na"], ["Fe"])] }), ProblemTypes.UnknownPart, "/force/0/den/0");
        Points(Fails(new RatioSelectionOptions { Amalgamations = amalgamations, Force = [new(["hardness", "Na"], ["Cl"], RatioKind.Amalgamation)] }), ProblemTypes.InvalidRatio, "/force/0/num/0");
        Points(Fails(new RatioSelectionOptions { Amalgamations = amalgamations, Force = [new(["hardness"], ["Cl"], RatioKind.Balance)] }), ProblemTypes.InvalidRatio, "/force/0/kind");
        Points(Fails(new RatioSelectionOptions { Force = [new(["Na", "K"], ["Cl"])] }), ProblemTypes.InvalidRatio, "/force/0/kind");
        Points(Fails(new RatioSelectionOptions { Force = [new(["Na", "Cl"], ["Cl"], RatioKind.Amalgamation)] }), ProblemTypes.InvalidRatio, "/force/0");
    }

    [Fact]
    public void AZeroCellIsAZeroValueAtItsRowAndColumn()
    {
        var values = (double[])Water.Values.Clone();
        values[(4 * 8) + 7] = 0;
        Points(Fails(new RatioSelectionOptions(), CompositionTable.FromValues(Water.Parts, values)), ProblemTypes.ZeroValue, "/rows/4/7");
    }

    [Fact]
    public void ProportionalCompositionsHaveNoVariationToExplain()
    {
        var values = new double[30 * 8];
        for (var i = 0; i < 30; i++)
        {
            for (var j = 0; j < 8; j++)
            {
                values[(i * 8) + j] = (i + 1) * Water.Row(0)[j];
            }
        }

        Points(Fails(new RatioSelectionOptions(), CompositionTable.FromValues(Water.Parts, values)), ProblemTypes.NoVariation, "/rows");
    }

    [Fact]
    public void WeightsOfTheWrongLengthOrNotSummingToOneAreArgumentErrors()
    {
        Assert.Throws<ArgumentException>(() => RatioSelection.Run(Water, SeededAmalgamations.Equal(7), new RatioSelectionOptions()));
        Assert.Throws<ArgumentException>(() => RatioSelection.Run(Water, [.. Enumerable.Repeat(0.2, 8)], new RatioSelectionOptions()));
    }
}
