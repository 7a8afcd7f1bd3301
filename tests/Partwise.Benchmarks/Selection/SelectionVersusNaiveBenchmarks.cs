using BenchmarkDotNet.Attributes;
using Partwise.Core.Selection;
using Partwise.Core.Tables;

namespace Partwise.Benchmarks.Selection;

/// <summary>
/// The full stepwise selection path on J = 20 parts, n = 2,000 samples and 3 named amalgamations: the sufficient-statistics
/// path against the naive refit of every candidate at every step (the baseline). Goal: at least 1000 times faster.
/// </summary>
[MemoryDiagnoser]
[Config(typeof(TrendRatioConfig))]
public class SelectionVersusNaiveBenchmarks
{
    private CompositionTable _table = null!;
    private IReadOnlyList<NamedAmalgamation> _amalgamations = null!;
    private int[][] _named = null!;
    private double[] _weights = null!;

    [GlobalSetup]
    public void Setup()
    {
        _table = SelectionData.Mixtures(2026, 2_000, 20);
        _amalgamations = SelectionData.Amalgamations(2026, 20, 3);
        _named = [.. _amalgamations.Select(a => a.Parts.Select(_table.IndexOf).ToArray())];
        _weights = [.. Enumerable.Repeat(1.0 / 20, 20)];

        // Both paths must choose the same ratios, or the timing compares different work.
        var fast = Fast();
        var naive = Naive();
        if (fast.Steps.Count != naive.Count)
        {
            throw new InvalidOperationException($"The paths differ in length: {fast.Steps.Count} and {naive.Count}.");
        }

        for (var s = 0; s < naive.Count; s++)
        {
            var step = fast.Steps[s];
            var p = Column(step.Ratio.Numerator);
            var q = Column(step.Ratio.Denominator);
            if ((p, q) != (naive[s].P, naive[s].Q) || Math.Abs(step.Explained - naive[s].Explained) > 1e-10)
            {
                throw new InvalidOperationException($"Step {s} differs: fast ({p}, {q}) {step.Explained}, naive ({naive[s].P}, {naive[s].Q}) {naive[s].Explained}.");
            }
        }
    }

    [Benchmark(Baseline = true)]
    public IReadOnlyList<NaiveStep> Naive() => NaiveRatioSelection.Run(_table, _weights, _named, null, [], 19);

    [Benchmark]
    public RatioSelectionResult Fast() => RatioSelection.Run(_table, _weights, new RatioSelectionOptions { Amalgamations = _amalgamations });

    private int Column(IReadOnlyList<int> side)
    {
        if (side.Count == 1)
        {
            return side[0];
        }

        for (var a = 0; a < _named.Length; a++)
        {
            if (_named[a].Length == side.Count && side.All(_named[a].Contains))
            {
                return 20 + a;
            }
        }

        throw new InvalidOperationException("The side is no named amalgamation.");
    }
}
