using BenchmarkDotNet.Attributes;
using Partwise.Core.Screening;

namespace Partwise.Benchmarks.Screening;

/// <summary>
/// Fitting a baseline from 10,000 reference samples of J = 10 parts in pivot coordinates (p = 9), 5% of them gross
/// outliers. Goal for the robust (FAST-MCD) fit: ≤ 2 s. The classical fit (mean and covariance) is the baseline.
/// </summary>
[MemoryDiagnoser]
public class BaselineFitBenchmarks
{
    private const int J = 10;

    private double[] _map = null!;
    private double[] _coordinates = null!;

    [GlobalSetup]
    public void Setup()
    {
        _map = BenchmarkWaters.PivotMap(J);
        _coordinates = BenchmarkWaters.Coordinates(BenchmarkWaters.Values(seed: 3, n: 10_000, outlierShare: 0.05), _map, J);
    }

    [Benchmark(Baseline = true)]
    public Baseline ClassicalFit() =>
        BaselineFit.Fit(BenchmarkWaters.Parts, _map, _coordinates, new BaselineOptions { Scatter = ScatterMethod.Classical }).Baseline;

    [Benchmark]
    public Baseline RobustFit() => BaselineFit.Fit(BenchmarkWaters.Parts, _map, _coordinates).Baseline;
}
