using System.Text.Json;
using Partwise.Benchmarks.Selection;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

/// <summary>The selection path and its statistics against numpy and scipy (tests/reference/*.py).</summary>
public class SelectionReferenceTests
{
    internal static double[][] Rows(CompositionTable table) => [.. Enumerable.Range(0, table.RowCount).Select(i => table.Row(i).ToArray())];

    internal static object RatioJson(LogRatio r) => new
    {
        num = r.Numerator,
        den = r.Denominator,
        kind = r.Kind switch { RatioKind.Balance => "balance", RatioKind.Amalgamation => "amalgamation", _ => "pairwise" },
    };

    // Reference: tests/reference/ratio_selection_naive.py, the definition refitted with numpy.linalg.lstsq for every
    // candidate at every step (Greenacre 2019, Math. Geosci. 51:649-682).
    [NeedsPythonFact]
    public void PathMatchesANumpyRefitOfEveryCandidate()
    {
        var script = ReferenceFiles.Read("ratio_selection_naive.py");
        foreach (var (seed, n, parts, m, unequal, exclude) in new[] { (81, 70, 7, 3, false, -1), (82, 120, 9, 4, true, 2), (83, 40, 6, 2, true, -1) })
        {
            var table = SeededAmalgamations.Structured(seed, n, parts);
            var amalgamations = SeededAmalgamations.Amalgamations(seed, parts, m);
            var named = SeededAmalgamations.Indices(table, amalgamations);
            var w = unequal ? SeededAmalgamations.Unequal(seed, parts) : SeededAmalgamations.Equal(parts);
            var excluded = Enumerable.Range(0, parts).Select(j => j == exclude).ToArray();
            var maxRatios = parts - 1 - (exclude >= 0 ? 1 : 0);

            var fast = RatioSelection.Run(table, w, new RatioSelectionOptions
            {
                Amalgamations = amalgamations,
                Exclude = exclude >= 0 ? [$"p{exclude}"] : [],
            });
            var reference = PythonReference.Run(script, new { values = Rows(table), weights = w, amalgamations = named, excluded, maxRatios, target = 1.0 });

            var steps = reference.GetProperty("steps").EnumerateArray().ToArray();
            Assert.Equal(steps.Length, fast.Steps.Count);
            for (var s = 0; s < steps.Length; s++)
            {
                var step = fast.Steps[s];
                Assert.Equal(
                    (steps[s].GetProperty("p").GetInt32(), steps[s].GetProperty("q").GetInt32()),
                    (SelectionAssertions.Column(step.Ratio.Numerator, parts, named), SelectionAssertions.Column(step.Ratio.Denominator, parts, named)));
                Tolerance.Close(steps[s].GetProperty("explained").GetDouble(), step.Explained, 1e-8, 0, $"explained at step {s} (seed {seed})");
            }
        }
    }

    // Reference: scipy.spatial.procrustes, whose disparity d gives the Procrustes correlation sqrt(1 − d) when the ratio
    // configuration is padded with zero columns to J (METHODS.md item 5; Gower 1975, Psychometrika 40:33-51).
    [NeedsPythonFact]
    public void ProcrustesCorrelationOfEveryStepEqualsScipyProcrustes()
    {
        var table = SeededAmalgamations.Structured(84, 90, 7);
        var amalgamations = SeededAmalgamations.Amalgamations(84, 7, 3);
        var w = SeededAmalgamations.Unequal(84, 7);
        var fast = RatioSelection.Run(table, w, new RatioSelectionOptions
        {
            Amalgamations = amalgamations,
            Force = [new(["p1", "p2"], ["p6"], RatioKind.Balance), new(["p0", "p3"], ["p5"], RatioKind.Amalgamation)],
        });

        var reference = PythonReference.Run(
            ReferenceFiles.Read("ratio_set_reference.py"),
            new { values = Rows(table), weights = w, ratios = fast.Steps.Select(s => RatioJson(s.Ratio)).ToArray() });

        var expected = reference.GetProperty("procrustes").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        Tolerance.Close(expected, fast.Steps.Select(s => s.Procrustes).ToArray(), 1e-8, 0, "procrustes");
        Tolerance.Close(reference.GetProperty("explained").GetDouble(), fast.Steps[^1].Explained, 1e-8, 0, "explained");
    }

    // Reference: numpy.cov (divisor n − 1) of the augmented logs, as a distributed engine would send them; the moments
    // path must give the table's path (METHODS.md: "everything above needs only K0").
    [NeedsPythonFact]
    public void MomentsFromNumpyGiveTheSamePathAsTheTable()
    {
        var table = SeededAmalgamations.Structured(85, 150, 8);
        var amalgamations = SeededAmalgamations.Amalgamations(85, 8, 3);
        var w = SeededAmalgamations.Unequal(85, 8);
        var options = new RatioSelectionOptions { Amalgamations = amalgamations, Force = [new(["s0"], ["p7"])], Explained = 0.99 };
        var reference = PythonReference.Run(ReferenceFiles.Read("log_moments.py"), new { values = Rows(table), amalgamations = SeededAmalgamations.Indices(table, amalgamations) });

        var covariance = reference.GetProperty("covariance").Deserialize<double[][]>()!;
        var moments = new SelectionMoments([.. table.Parts, .. amalgamations.Select(a => a.Name)], covariance, reference.GetProperty("count").GetInt64());

        MomentsTests.SamePath(RatioSelection.Run(table, w, options), RatioSelection.Run(moments, w, options), 1e-10);
    }
}
