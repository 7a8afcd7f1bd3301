using BenchmarkDotNet.Columns;
using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Reports;

namespace Partwise.Benchmarks.Selection;

/// <summary>Shows ratios to the baseline as "N x faster" so that ratios far below 0.001 stay readable.</summary>
public sealed class TrendRatioConfig : ManualConfig
{
    public TrendRatioConfig()
    {
        SummaryStyle = SummaryStyle.Default.WithRatioStyle(RatioStyle.Trend);
    }
}
