using Partwise.Core.Problems;
using Partwise.Core.Tables;
using Partwise.Core.Transforms;

namespace Partwise.Core.Variance;

/// <summary>Summary statistics of a strictly positive table; every variance uses the divisor n − 1.</summary>
/// <param name="Center">The closed geometric mean C(exp(mean ln x)), summing to 1 (Aitchison 1986, §4.7).</param>
/// <param name="VariationMatrix">T_ab = var(ln(x_a / x_b)), J × J row-major, zero diagonal (Aitchison 1986, §4.4).</param>
/// <param name="TotalVariance">TV = Σ_{a&lt;b} w_a w_b T_ab = Σ_j w_j var(clr_j) (Greenacre 2019, Math. Geosci. 51:649-682).</param>
/// <param name="PartContributions">w_j var(clr_j) / TV, summing to 1.</param>
/// <param name="ClrCovariance">Covariance of the weighted clr, J × J row-major.</param>
/// <param name="Weights">The part weights used (sum 1).</param>
/// <param name="Divisor">The divisor of every variance here: <c>n-1</c>.</param>
public sealed record CompositionSummary(
    double[] Center,
    double[] VariationMatrix,
    double TotalVariance,
    double[] PartContributions,
    double[] ClrCovariance,
    double[] Weights,
    string Divisor)
{
    /// <summary>
    /// Computes the summary of a strictly positive table with at least two rows.
    /// </summary>
    /// <param name="table">Strictly positive (apply a zero policy first), n ≥ 2.</param>
    /// <param name="weights">Part weights (length J, sum 1), or null for 1/J.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows of each pass; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <exception cref="CompositionException">Fewer than two rows (no variance exists).</exception>
    public static CompositionSummary Compute(CompositionTable table, double[]? weights = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var n = table.RowCount;
        var j = table.PartCount;
        if (n < 2)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/rows", "Variances need at least two rows.");
        }

        var w = weights ?? Enumerable.Repeat(1.0 / j, j).ToArray();
        var clr = Clr.Forward(table, w, cancellationToken).Values;

        // Means of ln x give the geometric-mean centre; the clr means are the same up to a common shift.
        var meanLog = new double[j];
        var source = table.Values;
        for (var i = 0; i < n; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            for (var k = 0; k < j; k++)
            {
                meanLog[k] += Math.Log(source[(i * j) + k]);
            }
        }

        for (var k = 0; k < j; k++)
        {
            meanLog[k] /= n;
        }

        var center = new double[j];
        Clr.ExpClose(meanLog, center, 1.0);

        var meanClr = new double[j];
        for (var i = 0; i < n; i++)
        {
            for (var k = 0; k < j; k++)
            {
                meanClr[k] += clr[(i * j) + k];
            }
        }

        for (var k = 0; k < j; k++)
        {
            meanClr[k] /= n;
        }

        var cov = new double[j * j];
        var centred = new double[j];
        for (var i = 0; i < n; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            for (var k = 0; k < j; k++)
            {
                centred[k] = clr[(i * j) + k] - meanClr[k];
            }

            for (var a = 0; a < j; a++)
            {
                var ca = centred[a];
                for (var b = a; b < j; b++)
                {
                    cov[(a * j) + b] += ca * centred[b];
                }
            }
        }

        for (var a = 0; a < j; a++)
        {
            for (var b = a; b < j; b++)
            {
                var value = cov[(a * j) + b] / (n - 1);
                cov[(a * j) + b] = value;
                cov[(b * j) + a] = value;
            }
        }

        // var(ln x_a − ln x_b) = var(clr_a − clr_b), whatever the weights, since the centring term cancels.
        var variation = new double[j * j];
        for (var a = 0; a < j; a++)
        {
            for (var b = 0; b < j; b++)
            {
                variation[(a * j) + b] = a == b ? 0 : Math.Max(0, cov[(a * j) + a] + cov[(b * j) + b] - (2 * cov[(a * j) + b]));
            }
        }

        var contributions = new double[j];
        var total = 0.0;
        for (var k = 0; k < j; k++)
        {
            contributions[k] = w[k] * cov[(k * j) + k];
            total += contributions[k];
        }

        for (var k = 0; k < j; k++)
        {
            contributions[k] = total > 0 ? contributions[k] / total : 0;
        }

        return new CompositionSummary(center, variation, total, contributions, cov, w, "n-1");
    }
}
