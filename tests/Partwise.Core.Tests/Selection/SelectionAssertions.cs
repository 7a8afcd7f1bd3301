using Partwise.Benchmarks.Selection;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

/// <summary>Comparisons between the fast selection path and reference paths.</summary>
internal static class SelectionAssertions
{
    /// <summary>The augmented column of a ratio side: the part, or J + the index of the named amalgamation with that set.</summary>
    public static int Column(IReadOnlyList<int> side, int partCount, int[][] named)
    {
        if (side.Count == 1)
        {
            return side[0];
        }

        for (var a = 0; a < named.Length; a++)
        {
            if (named[a].Length == side.Count && side.All(named[a].Contains))
            {
                return partCount + a;
            }
        }

        throw new InvalidOperationException("The side is no named amalgamation.");
    }

    /// <summary>Asserts the same candidates in the same order, with fractions and Procrustes correlations within tolerance.</summary>
    public static void SamePath(IReadOnlyList<NaiveStep> expected, RatioSelectionResult actual, int partCount, int[][] named, double tolerance)
    {
        Assert.Equal(expected.Count, actual.Steps.Count);
        var previous = 0.0;
        for (var s = 0; s < expected.Count; s++)
        {
            var step = actual.Steps[s];
            if (expected[s].Forced < 0)
            {
                Assert.False(step.Forced);
                Assert.Equal((expected[s].P, expected[s].Q), (Column(step.Ratio.Numerator, partCount, named), Column(step.Ratio.Denominator, partCount, named)));
            }
            else
            {
                Assert.True(step.Forced);
            }

            Tolerance.Close(expected[s].Explained, step.Explained, tolerance, 0, $"explained at step {s}");
            Tolerance.Close(expected[s].Explained - previous, step.Gain, tolerance, 0, $"gain at step {s}");
            Tolerance.Close(expected[s].Procrustes, step.Procrustes, tolerance, 0, $"procrustes at step {s}");
            previous = expected[s].Explained;
        }
    }

    /// <summary>The values of a ratio over the rows of a table.</summary>
    public static double[] Values(CompositionTable table, LogRatio ratio) =>
        [.. Enumerable.Range(0, table.RowCount).Select(i => ratio.Evaluate(table.Row(i)))];
}
