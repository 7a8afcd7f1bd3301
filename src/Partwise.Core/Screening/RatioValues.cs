using Partwise.Core.Ratios;

namespace Partwise.Core.Screening;

/// <summary>Small helpers shared by fitting and screening.</summary>
internal static class RatioValues
{
    /// <summary>The ratio in ratio units: x_a / x_b, Σ_A x / Σ_B x, or e^b for a balance b (row strictly positive).</summary>
    internal static double Of(LogRatio ratio, ReadOnlySpan<double> row)
    {
        switch (ratio.Kind)
        {
            case RatioKind.Pairwise:
                return row[ratio.Numerator[0]] / row[ratio.Denominator[0]];
            case RatioKind.Amalgamation:
                {
                    double a = 0, b = 0;
                    foreach (var j in ratio.Numerator)
                    {
                        a += row[j];
                    }

                    foreach (var j in ratio.Denominator)
                    {
                        b += row[j];
                    }

                    return a / b;
                }

            default:
                return Math.Exp(ratio.Evaluate(row));
        }
    }

    /// <summary>The median (the mean of the two middle values for an even count), of a copy.</summary>
    internal static double Median(double[] values)
    {
        var sorted = (double[])values.Clone();
        Array.Sort(sorted);
        var m = sorted.Length / 2;
        return sorted.Length % 2 == 1 ? sorted[m] : (sorted[m - 1] + sorted[m]) / 2;
    }
}
