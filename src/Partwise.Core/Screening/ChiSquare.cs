using MathNet.Numerics;
using MathNet.Numerics.Distributions;

namespace Partwise.Core.Screening;

/// <summary>
/// The chi-square distribution pieces that screening needs, from MathNet.Numerics: the quantile that becomes a
/// baseline's threshold and the upper tail that becomes a sample's p-value. A squared Mahalanobis distance of a
/// p-variate normal vector from its mean follows χ² with p degrees of freedom.
/// </summary>
public static class ChiSquare
{
    /// <summary>
    /// The quantile q with F_χ²(q; k) = <paramref name="probability"/> (MathNet <c>ChiSquared.InvCDF</c>).
    /// </summary>
    /// <param name="probability">In (0, 1).</param>
    /// <param name="degreesOfFreedom">k ≥ 1.</param>
    /// <exception cref="ArgumentOutOfRangeException">A probability outside (0, 1) or k &lt; 1.</exception>
    public static double Quantile(double probability, int degreesOfFreedom)
    {
        if (!(probability > 0 && probability < 1))
        {
            throw new ArgumentOutOfRangeException(nameof(probability), probability, "A probability must lie in (0, 1).");
        }

        ArgumentOutOfRangeException.ThrowIfLessThan(degreesOfFreedom, 1);
        return ChiSquared.InvCDF(degreesOfFreedom, probability);
    }

    /// <summary>
    /// The upper tail 1 − F_χ²(x; k) = Q(k/2, x/2), the regularised upper incomplete gamma function, evaluated
    /// directly rather than as a difference from 1 so that small p-values keep their digits.
    /// </summary>
    /// <param name="x">x ≥ 0 (a negative x is treated as 0 and gives 1).</param>
    /// <param name="degreesOfFreedom">k ≥ 1.</param>
    /// <returns>A value in [0, 1]; 0 once the tail underflows, never NaN.</returns>
    public static double UpperTail(double x, int degreesOfFreedom)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(degreesOfFreedom, 1);
        if (double.IsNaN(x))
        {
            throw new ArgumentOutOfRangeException(nameof(x), x, "The statistic must be a number.");
        }

        if (x <= 0)
        {
            return 1;
        }

        if (double.IsPositiveInfinity(x))
        {
            return 0;
        }

        var q = SpecialFunctions.GammaUpperRegularized(degreesOfFreedom / 2.0, x / 2);
        return double.IsFinite(q) ? Math.Clamp(q, 0, 1) : 0;
    }

    /// <summary>The distribution function F_χ²(x; k) (MathNet <c>ChiSquared.CDF</c>), for x ≥ 0.</summary>
    public static double Cdf(double x, int degreesOfFreedom)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(degreesOfFreedom, 1);
        return x <= 0 ? 0 : ChiSquared.CDF(degreesOfFreedom, x);
    }
}
