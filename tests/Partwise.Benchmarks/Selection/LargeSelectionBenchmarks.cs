using BenchmarkDotNet.Attributes;
using Partwise.Core.Selection;
using Partwise.Core.Tables;

namespace Partwise.Benchmarks.Selection;

/// <summary>
/// The full path (99 steps) on J = 100 parts and 10 named amalgamations: from a table of n = 10,000 (goal ≤ 100 ms), and
/// from moments of n = 10,000 and n = 100,000 samples, whose time does not depend on n.
/// </summary>
[MemoryDiagnoser]
[Config(typeof(TrendRatioConfig))]
public class LargeSelectionBenchmarks
{
    private CompositionTable _table = null!;
    private SelectionMoments _moments10k = null!;
    private SelectionMoments _moments100k = null!;
    private RatioSelectionOptions _options = null!;
    private double[] _weights = null!;

    [GlobalSetup]
    public void Setup()
    {
        var amalgamations = SelectionData.Amalgamations(77, 100, 10);
        _options = new RatioSelectionOptions { Amalgamations = amalgamations };
        _weights = [.. Enumerable.Repeat(1.0 / 100, 100)];
        _table = SelectionData.Mixtures(77, 10_000, 100);
        _moments10k = SelectionData.Moments(_table, amalgamations);
        _moments100k = SelectionData.Moments(SelectionData.Mixtures(78, 100_000, 100), amalgamations);

        // The moments path is the table's path.
        var fromTable = FromTable10k();
        var fromMoments = FromMoments10k();
        if (!fromTable.Steps.Select(s => s.Label).SequenceEqual(fromMoments.Steps.Select(s => s.Label)))
        {
            throw new InvalidOperationException("The paths from the table and from its moments differ.");
        }
    }

    [Benchmark(Baseline = true)]
    public RatioSelectionResult FromTable10k() => RatioSelection.Run(_table, _weights, _options);

    [Benchmark]
    public RatioSelectionResult FromMoments10k() => RatioSelection.Run(_moments10k, _weights, _options);

    [Benchmark]
    public RatioSelectionResult FromMoments100k() => RatioSelection.Run(_moments100k, _weights, _options);
}
