using Partwise.Benchmarks.Selection;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class RatioSelectionTests
{
    public static TheoryData<int, int, int, int, bool> SeededCases => new()
    {
        { 1, 60, 6, 2, false },
        { 2, 80, 8, 3, true },
        { 3, 40, 10, 4, false },
        { 4, 120, 7, 3, true },
        { 5, 30, 5, 0, false },
        { 6, 200, 9, 5, true },
    };

    // Reference: the definition of the explained fraction and of the greedy step (Greenacre 2019, Math. Geosci.
    // 51:649-682; METHODS.md "Variance", "Stepwise ratio selection"), refitted by least squares for every candidate.
    [Theory]
    [MemberData(nameof(SeededCases))]
    public void FastPathChoosesTheSameRatiosAsTheNaiveRefit(int seed, int n, int parts, int amalgamationCount, bool unequalWeights)
    {
        var table = SeededAmalgamations.Structured(seed, n, parts);
        var amalgamations = SeededAmalgamations.Amalgamations(seed, parts, amalgamationCount);
        var w = unequalWeights ? SeededAmalgamations.Unequal(seed, parts) : SeededAmalgamations.Equal(parts);
        var named = SeededAmalgamations.Indices(table, amalgamations);

        var fast = RatioSelection.Run(table, w, new RatioSelectionOptions { Amalgamations = amalgamations });
        var naive = NaiveRatioSelection.Run(table, w, named, null, [], parts - 1);

        SelectionAssertions.SamePath(naive, fast, parts, named, 1e-10);
    }

    // Same reference on independent log-normal parts (no shared structure) and on a path stopped early.
    [Theory]
    [InlineData(11, 50, 7, 0.9)]
    [InlineData(12, 300, 12, 0.75)]
    [InlineData(13, 25, 6, 1.0)]
    public void FastPathMatchesTheNaiveRefitOnIndependentPartsAndStopsWhereItShould(int seed, int n, int parts, double target)
    {
        var table = SeededCompositions.Table(seed, n, parts);
        var amalgamations = SeededAmalgamations.Amalgamations(seed, parts, 3);
        var named = SeededAmalgamations.Indices(table, amalgamations);
        var w = SeededAmalgamations.Equal(parts);

        var fast = RatioSelection.Run(table, w, new RatioSelectionOptions { Amalgamations = amalgamations, Explained = target });
        var naive = NaiveRatioSelection.Run(table, w, named, null, [], parts - 1, target);

        SelectionAssertions.SamePath(naive, fast, parts, named, 1e-10);
        if (target < 1)
        {
            // The step that first reaches the target is included, and it is the first to reach it (API.md ratio-selection).
            Assert.True(fast.Steps[^1].Explained >= target);
            Assert.All(fast.Steps.SkipLast(1), s => Assert.True(s.Explained < target));
        }
    }

    [Fact]
    public void AmalgamationRatiosWinStepsOnStructuredData()
    {
        // Guards the comparisons above against testing pairwise ratios only: on seed 2 an amalgamation is chosen.
        var table = SeededAmalgamations.Structured(2, 80, 8);
        var fast = RatioSelection.Run(table, SeededAmalgamations.Unequal(2, 8), new RatioSelectionOptions { Amalgamations = SeededAmalgamations.Amalgamations(2, 8, 3) });
        Assert.Contains(fast.Steps, s => s.Ratio.Kind == RatioKind.Amalgamation);
    }

    [Theory]
    [InlineData(21)]
    [InlineData(22)]
    public void ForcedRatiosOfEveryKindAndExclusionsMatchTheNaiveRefit(int seed)
    {
        var table = SeededAmalgamations.Structured(seed, 90, 8);
        var amalgamations = SeededAmalgamations.Amalgamations(seed, 8, 3);
        var w = SeededAmalgamations.Unequal(seed, 8);
        var excludedPart = Enumerable.Range(0, 8).First(j => amalgamations.Any(a => a.Parts.Contains($"p{j}")));
        var excluded = new bool[8];
        excluded[excludedPart] = true;
        var keep = Enumerable.Range(0, 8).Where(j => j != excludedPart).ToArray();
        var clean = amalgamations.First(a => !a.Parts.Contains($"p{excludedPart}"));
        var outside = keep.First(j => !clean.Parts.Contains($"p{j}"));

        RatioTerms[] force =
        [
            new([$"p{keep[0]}"], [$"p{keep[1]}"]),
            new([clean.Name], [$"p{outside}"]),
            new([$"p{keep[2]}", $"p{keep[3]}"], [$"p{keep[4]}"], RatioKind.Amalgamation),
            new([$"p{keep[1]}", $"p{keep[5]}"], [$"p{keep[6]}"], RatioKind.Balance),
        ];
        var options = new RatioSelectionOptions
        {
            Amalgamations = amalgamations,
            Force = force,
            Exclude = [$"p{excludedPart}"],
        };

        var fast = RatioSelection.Run(table, w, options);

        var forcedColumns = fast.Steps.Take(force.Length).Select(s => SelectionAssertions.Values(table, s.Ratio)).ToArray();
        var naive = NaiveRatioSelection.Run(table, w, SeededAmalgamations.Indices(table, amalgamations), excluded, forcedColumns, 6);
        SelectionAssertions.SamePath(naive, fast, 8, SeededAmalgamations.Indices(table, amalgamations), 1e-10);
        Assert.Equal(force.Length, fast.Steps.Count(s => s.Forced));
        Assert.Equal($"{clean.Name}/p{outside}", fast.Steps[1].Label);
        Assert.DoesNotContain(fast.Steps.Skip(force.Length), s => s.Ratio.Numerator.Concat(s.Ratio.Denominator).Contains(excludedPart));
        Assert.False(fast.Invertible); // an excluded part is never determined
    }

    [Fact]
    public void ResultsSpeakInTheGivenAmalgamationNamesAndPartNames()
    {
        var table = SeededAmalgamations.Groundwater(7, 150);
        var fast = RatioSelection.Run(table, SeededAmalgamations.Equal(8), new RatioSelectionOptions
        {
            Amalgamations = SeededAmalgamations.GroundwaterAmalgamations,
            Force = [new(["hardness"], ["alkalis"]), new(["Na"], ["Cl"])],
        });

        Assert.Equal("hardness/alkalis", fast.Steps[0].Label);
        Assert.Equal("Na/Cl", fast.Steps[1].Label);
        Assert.Equal(RatioKind.Amalgamation, fast.Steps[0].Ratio.Kind);
        Assert.Equal(["Ca", "Mg"], fast.Steps[0].Ratio.Numerator.Select(j => table.Parts[j]));
        Assert.Equal("n", fast.Divisor);
        Assert.Equal(fast.Steps.Count, fast.Graph.Edges.Count);
        Assert.Equal(new RatioEdge("hardness", "alkalis", "hardness/alkalis"), fast.Graph.Edges[0]);
        Assert.Contains("hardness", fast.Graph.Nodes);
    }

    // METHODS.md "Variance": TV = Σ_{i<j} w_i w_j var(ln(x_i/x_j)) = Σ_j w_j var(clr_j) (Aitchison 1986; weighted form
    // Greenacre & Lewi 2009), with divisor n.
    [Fact]
    public void TotalVarianceIsTheWeightedSumOfPairwiseLogRatioVariances()
    {
        var table = SeededAmalgamations.Structured(31, 70, 6);
        var w = SeededAmalgamations.Unequal(31, 6);
        var fast = RatioSelection.Run(table, w, new RatioSelectionOptions { MaxRatios = 1 });

        var pairwise = 0.0;
        var clr = 0.0;
        for (var a = 0; a < 6; a++)
        {
            for (var b = a + 1; b < 6; b++)
            {
                pairwise += w[a] * w[b] * Variance(Enumerable.Range(0, 70).Select(i => Math.Log(table.Row(i)[a] / table.Row(i)[b])));
            }

            clr += w[a] * Variance(Enumerable.Range(0, 70).Select(i =>
            {
                var row = table.Row(i);
                var mean = 0.0;
                for (var c = 0; c < 6; c++)
                {
                    mean += w[c] * Math.Log(row[c]);
                }

                return Math.Log(row[a]) - mean;
            }));
        }

        Tolerance.Close(pairwise, fast.TotalVariance, 1e-13, 1e-11, "Σ w_i w_j var(ln x_i/x_j)");
        Tolerance.Close(clr, fast.TotalVariance, 1e-13, 1e-11, "Σ w_j var(clr_j)");
    }

    // Greenacre 2019 (Math. Geosci. 51:649-682): J − 1 pairwise log-ratios that form a spanning tree of the parts explain
    // all of the log-ratio variance. Unforced selection without amalgamations therefore reaches 100% in J − 1 steps with an
    // acyclic connected graph over all parts, which is invertible.
    [Theory]
    [InlineData(41, 6)]
    [InlineData(42, 11)]
    public void PairwiseSelectionEndsInASpanningTreeThatExplainsEverything(int seed, int parts)
    {
        var table = SeededCompositions.Table(seed, 80, parts);
        var fast = RatioSelection.Run(table, SeededAmalgamations.Equal(parts), new RatioSelectionOptions());

        Assert.Equal(parts - 1, fast.Steps.Count);
        Tolerance.Close(1.0, fast.Steps[^1].Explained, 1e-12, 0, "explained by the tree");
        Assert.True(fast.Graph.Acyclic);
        Assert.True(fast.Graph.Connected);
        Assert.Equal(parts, fast.Graph.Nodes.Count);
        Assert.True(fast.Invertible);
    }

    // Ties (METHODS.md): a part that is an exact multiple of another gives candidates with equal fractions; the first in
    // candidate order wins, and the constant ratio between the twins has no variance and is never a candidate step.
    [Fact]
    public void TiesGoToTheFirstCandidateInOrder()
    {
        var source = SeededCompositions.Table(51, 40, 4);
        var values = new double[40 * 5];
        for (var i = 0; i < 40; i++)
        {
            var row = source.Row(i);
            values[i * 5] = row[0];
            values[(i * 5) + 1] = row[1];
            values[(i * 5) + 2] = row[2];
            values[(i * 5) + 3] = row[3];
            values[(i * 5) + 4] = 3 * row[1]; // p4 is p1 in other units
        }

        var table = CompositionTable.FromValues(["p0", "p1", "p2", "p3", "p4"], values);
        var fast = RatioSelection.Run(table, SeededAmalgamations.Equal(5), new RatioSelectionOptions());
        var naive = NaiveRatioSelection.Run(table, SeededAmalgamations.Equal(5), [], null, [], 4);

        SelectionAssertions.SamePath(naive, fast, 5, [], 1e-10);

        // Every ratio with p4 ties with the same ratio with p1, which comes first; p0..p3 then span everything.
        Assert.DoesNotContain(fast.Steps, s => s.Ratio.Numerator.Contains(4) || s.Ratio.Denominator.Contains(4));
        Assert.Equal(3, fast.Steps.Count);
        Tolerance.Close(1.0, fast.Steps[^1].Explained, 1e-12, 0, "explained");
    }

    [Fact]
    public void MaxRatiosBoundsThePathAndDefaultsToUsablePartsLessOne()
    {
        var table = SeededAmalgamations.Structured(61, 50, 7);
        Assert.Equal(3, RatioSelection.Run(table, SeededAmalgamations.Equal(7), new RatioSelectionOptions { MaxRatios = 3 }).Steps.Count);
        Assert.Equal(4, RatioSelection.Run(table, SeededAmalgamations.Equal(7), new RatioSelectionOptions { Exclude = ["p0", "p3"] }).Steps.Count);
    }

    private static double Variance(IEnumerable<double> values)
    {
        var x = values.ToArray();
        var mean = x.Average();
        return x.Sum(v => (v - mean) * (v - mean)) / x.Length;
    }
}
