using BenchmarkDotNet.Attributes;
using Partwise.Core.Screening;

namespace Partwise.Benchmarks.Screening;

/// <summary>
/// Batch screening of 10,000 samples against a robust ilr baseline of J = 10 parts (goal: ≥ 200,000 samples/s
/// in-process). Times are per sample. The baseline method is a plain Mahalanobis loop (logs, coordinates, forward
/// substitution) with no validation, reasons or rules.
/// </summary>
[MemoryDiagnoser]
public class ScreeningBenchmarks
{
    private const int Samples = 10_000;
    private const int J = 10;

    private Baseline _baseline = null!;
    private double[] _rows = null!;
    private IReadOnlyDictionary<string, double>[] _samples = null!;
    private double[] _distances = null!;
    private double[] _map = null!;
    private double[] _location = null!;
    private double[] _factor = null!;

    [GlobalSetup]
    public void Setup()
    {
        var reference = BenchmarkWaters.Values(seed: 1, n: 2000, outlierShare: 0.05);
        _map = BenchmarkWaters.PivotMap(J);
        _baseline = BaselineFit.Fit(BenchmarkWaters.Parts, _map, BenchmarkWaters.Coordinates(reference, _map, J)).Baseline;
        _rows = BenchmarkWaters.Values(seed: 2, n: Samples, outlierShare: 0.1);
        _samples = [.. Enumerable.Range(0, Samples).Select(i => (IReadOnlyDictionary<string, double>)BenchmarkWaters.Parts
            .Select((part, k) => (part, k)).ToDictionary(t => t.part, t => _rows[(i * J) + t.k], StringComparer.Ordinal))];
        _distances = new double[Samples];
        _location = [.. _baseline.Location];
        _factor = [.. _baseline.CholeskyFactor];
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Samples)]
    public double MahalanobisOnlyLoop()
    {
        const int p = J - 1;
        Span<double> y = stackalloc double[p];
        double total = 0;
        for (var i = 0; i < Samples; i++)
        {
            y.Clear();
            for (var r = 0; r < J; r++)
            {
                var l = Math.Log(_rows[(i * J) + r]);
                for (var c = 0; c < p; c++)
                {
                    y[c] += l * _map[(r * p) + c];
                }
            }

            double d2 = 0;
            for (var a = 0; a < p; a++)
            {
                var v = y[a] - _location[a];
                for (var m = 0; m < a; m++)
                {
                    v -= _factor[(a * p) + m] * y[m];
                }

                v /= _factor[(a * p) + a];
                y[a] = v;
                d2 += v * v;
            }

            total += d2;
        }

        return total;
    }

    [Benchmark(OperationsPerInvoke = Samples)]
    public double[] SquaredDistancesOnly()
    {
        Screener.SquaredDistances(_baseline, _rows, _distances);
        return _distances;
    }

    [Benchmark(OperationsPerInvoke = Samples)]
    public ScreeningResult[] ScreenRowsWithReasons() => Screener.ScreenRows(_baseline, _rows);

    [Benchmark(OperationsPerInvoke = Samples)]
    public ScreeningResult[] ScreenManyByPartName() => Screener.ScreenMany(_baseline, _samples);
}
