using BenchmarkDotNet.Attributes;
using Partwise.Core.Tables;
using Partwise.Core.Transforms;

namespace Partwise.Benchmarks.Transforms;

/// <summary>
/// clr and ilr of 100,000 × 20 in-process. Goal: at least 20 million values per second on one core, i.e. each
/// transform of the 2,000,000 values within 100 ms. The baseline is one Math.Log per value into a fresh array, the
/// least any log-ratio transform must do, so the ratios show the cost beyond the logs themselves.
/// </summary>
[MemoryDiagnoser]
public class TransformThroughputBenchmarks
{
    private CompositionTable _table = null!;
    private IlrBasis _basis = null!;

    [Params(100_000)]
    public int Rows { get; set; }

    [Params(20)]
    public int Parts { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20261202);
        var names = Enumerable.Range(0, Parts).Select(j => $"p{j}").ToArray();
        var values = new double[Rows * Parts];
        for (var k = 0; k < values.Length; k++)
        {
            values[k] = Math.Exp(4 * random.NextDouble());
        }

        _table = CompositionTable.FromValues(names, values);
        _basis = PivotBasis.Create(names);
    }

    [Benchmark(Baseline = true)]
    public double[] LogsOnly()
    {
        var source = _table.Values;
        var result = new double[source.Length];
        for (var k = 0; k < source.Length; k++)
        {
            result[k] = Math.Log(source[k]);
        }

        return result;
    }

    [Benchmark]
    public LogRatioCoordinates Clr() => Partwise.Core.Transforms.Clr.Forward(_table);

    [Benchmark]
    public LogRatioCoordinates IlrPivot() => Ilr.Forward(_table, _basis);
}
