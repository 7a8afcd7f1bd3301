namespace Partwise.Core.Screening;

/// <summary>
/// Cholesky factorisation S = L Lᵀ of small symmetric p × p matrices stored row-major, and the forward
/// substitution that turns it into squared Mahalanobis distances. Written over spans because the
/// minimum covariance determinant search factors thousands of scatter matrices and must not allocate per step.
/// </summary>
internal static class CholeskyKernel
{
    /// <summary>
    /// A pivot of the factorisation counts as zero when it is below this fraction of its diagonal entry, i.e. when
    /// the coordinate's squared multiple correlation with the preceding ones exceeds 1 − 10⁻¹²: the coordinates are
    /// then collinear to within rounding and every distance would be dominated by it.
    /// </summary>
    internal const double RelativePivotFloor = 1e-12;

    /// <summary>
    /// Factors S (row-major p × p, only the lower triangle is read) into lower-triangular L (row-major, upper part
    /// zeroed). Returns false when S is not numerically positive definite (a zero, negative or collinear pivot).
    /// </summary>
    /// <param name="s">The symmetric matrix.</param>
    /// <param name="p">Its order.</param>
    /// <param name="l">Receives L; may not alias <paramref name="s"/>.</param>
    /// <param name="logDeterminant">ln det S = 2 Σ ln Lₖₖ when the factorisation succeeds, else −∞.</param>
    internal static bool TryFactor(ReadOnlySpan<double> s, int p, Span<double> l, out double logDeterminant)
    {
        logDeterminant = double.NegativeInfinity;
        l[..(p * p)].Clear();
        double sumLog = 0;
        for (var k = 0; k < p; k++)
        {
            var diagonal = s[(k * p) + k];
            if (!(diagonal > 0) || !double.IsFinite(diagonal))
            {
                return false;
            }

            var pivot = diagonal;
            for (var m = 0; m < k; m++)
            {
                pivot -= l[(k * p) + m] * l[(k * p) + m];
            }

            if (!(pivot > RelativePivotFloor * diagonal))
            {
                return false;
            }

            var root = Math.Sqrt(pivot);
            l[(k * p) + k] = root;
            sumLog += Math.Log(root);
            for (var i = k + 1; i < p; i++)
            {
                var v = s[(i * p) + k];
                for (var m = 0; m < k; m++)
                {
                    v -= l[(i * p) + m] * l[(k * p) + m];
                }

                l[(i * p) + k] = v / root;
            }
        }

        logDeterminant = 2 * sumLog;
        return true;
    }

    /// <summary>
    /// The squared Mahalanobis distance (x − μ)ᵀ S⁻¹ (x − μ) = ‖L⁻¹ (x − μ)‖², by forward substitution in
    /// <paramref name="work"/> (length ≥ p). O(p²/2), no allocation.
    /// </summary>
    internal static double SquaredDistance(ReadOnlySpan<double> x, ReadOnlySpan<double> mean, ReadOnlySpan<double> l, int p, Span<double> work)
    {
        double sum = 0;
        for (var i = 0; i < p; i++)
        {
            var v = x[i] - mean[i];
            var row = l.Slice(i * p, i);
            for (var m = 0; m < row.Length; m++)
            {
                v -= row[m] * work[m];
            }

            v /= l[(i * p) + i];
            work[i] = v;
            sum += v * v;
        }

        return sum;
    }
}
