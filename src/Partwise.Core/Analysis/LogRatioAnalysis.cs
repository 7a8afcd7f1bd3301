using System.Globalization;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;
using Partwise.Core.Problems;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Variance;

namespace Partwise.Core.Analysis;

/// <summary>
/// Log-ratio analysis (LRA): the weighted principal component analysis of the centred log-ratios, whose biplot shows
/// samples and parts together (Greenacre &amp; Lewi 2009, J. Classification 26:29-54).
/// </summary>
public static class LogRatioAnalysis
{
    /// <summary>
    /// Runs LRA on a strictly positive table.
    /// </summary>
    /// <param name="table">n ≥ 2 rows, J ≥ 2 parts, all values &gt; 0 (apply the zero policy first).</param>
    /// <param name="weights">Part weights: <see cref="PartWeightSpec.Equal"/> (1/J) or <see cref="PartWeightSpec.Mean"/>
    /// (mean closed proportions, Greenacre &amp; Lewi 2009); given weights also work.</param>
    /// <param name="dimensions">How many dimensions of coordinates to return, 1 ≤ d ≤ min(J − 1, n − 1).</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows while Z is built and between the QR and SVD steps; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>
    /// With Yc the weighted clr (clr_j = ln x_j − Σ_k w_k ln x_k) centred with row weights r = 1/n, and
    /// Z = D_r^(1/2) Yc D_w^(1/2) = U S V': all min(J − 1, n − 1) singular values; inertia fractions s_k² / TV, where
    /// Σ s_k² = TV = Σ_j w_j var(clr_j) (divisor n); row principal coordinates D_r^(−1/2) U S; part standard coordinates
    /// D_w^(−1/2) V; part contributions V² (each dimension's column sums to 1).
    /// </returns>
    /// <remarks>
    /// The SVD is computed as a thin QR of Z followed by the SVD of its J × J triangle (n ≥ J), so memory stays O(n J).
    /// Signs: singular vectors are defined up to sign, so each dimension is oriented to make the part with the largest
    /// |V_jk| (the first such part on a tie) positive, and the row coordinates follow. Dimensions with equal singular
    /// values have no unique axes.
    /// </remarks>
    /// <exception cref="CompositionException">A zero cell (<c>/rows/i/j</c>), weights that cannot be resolved
    /// (<c>/weights</c>), <c>dimensions</c> out of range (<see cref="ProblemTypes.InvalidOption"/> at <c>/dimensions</c>),
    /// or no log-ratio variance (<see cref="ProblemTypes.NoVariation"/> at <c>/rows</c>).</exception>
    public static LogRatioAnalysisResult Run(CompositionTable table, PartWeightSpec weights, int dimensions = 2, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(weights);
        PositiveTable.Require(table);
        var w = PartWeights.Resolve(weights, table, "/weights");
        int n = table.RowCount, j = table.PartCount;
        var available = Math.Min(j - 1, n - 1);
        if (dimensions < 1 || dimensions > available)
        {
            throw new CompositionException(
                ProblemTypes.InvalidOption,
                "/dimensions",
                string.Create(CultureInfo.InvariantCulture, $"dimensions must be between 1 and min(J − 1, n − 1) = {Math.Max(available, 0)}."));
        }

        var z = WeightedCentredClr(table, w, out var logScale, cancellationToken);
        var tv = 0.0;
        foreach (var v in z.AsColumnMajorArray())
        {
            tv += v * v;
        }

        if (!(tv > 1e-24 * logScale) || tv == 0)
        {
            throw new CompositionException(ProblemTypes.NoVariation, "/rows", "The compositions have no log-ratio variance (they are all proportional), so there is nothing to analyse.");
        }

        Matrix<double> u, vt;
        Vector<double> s;
        // The factorizations run inside MathNet without a token; the token is looked at between them.
        cancellationToken.ThrowIfCancellationRequested();
        if (n >= j)
        {
            var qr = z.QR(QRMethod.Thin);
            cancellationToken.ThrowIfCancellationRequested();
            var svd = qr.R.Svd(computeVectors: true);
            cancellationToken.ThrowIfCancellationRequested();
            u = qr.Q * svd.U;
            s = svd.S;
            vt = svd.VT;
        }
        else
        {
            var svd = z.Svd(computeVectors: true);
            u = svd.U;
            s = svd.S;
            vt = svd.VT;
        }

        var singular = new double[available];
        var inertia = new double[available];
        for (var k = 0; k < available; k++)
        {
            singular[k] = s[k];
            inertia[k] = s[k] * s[k] / tv;
        }

        var principal = new double[n][];
        for (var i = 0; i < n; i++)
        {
            principal[i] = new double[dimensions];
        }

        var standard = new double[j][];
        var contributions = new double[j][];
        for (var p = 0; p < j; p++)
        {
            standard[p] = new double[dimensions];
            contributions[p] = new double[dimensions];
        }

        var rootN = Math.Sqrt(n);
        for (var k = 0; k < dimensions; k++)
        {
            // Orientation: the part with the largest |V_jk| (first on a tie) is positive.
            var lead = 0;
            for (var p = 1; p < j; p++)
            {
                if (Math.Abs(vt[k, p]) > Math.Abs(vt[k, lead]))
                {
                    lead = p;
                }
            }

            var sign = vt[k, lead] < 0 ? -1.0 : 1.0;
            for (var p = 0; p < j; p++)
            {
                var v = sign * vt[k, p];
                standard[p][k] = v / Math.Sqrt(w[p]);
                contributions[p][k] = v * v;
            }

            for (var i = 0; i < n; i++)
            {
                principal[i][k] = sign * rootN * u[i, k] * s[k];
            }
        }

        return new LogRatioAnalysisResult(singular, inertia, tv, "n", table.Ids, principal, table.Parts, w, standard, contributions);
    }

    // Z_ij = √(1/n) (clr_ij − mean_i clr_ij) √w_j with clr_ij = ln x_ij − Σ_k w_k ln x_ik. logScale = Σ_j w_j var(ln x_j) + 1
    // bounds the size of the numbers whose cancellation TV is, for the no-variance test.
    private static Matrix<double> WeightedCentredClr(CompositionTable table, double[] w, out double logScale, CancellationToken cancellationToken)
    {
        int n = table.RowCount, j = table.PartCount;
        var z = Matrix<double>.Build.Dense(n, j);
        var data = z.AsColumnMajorArray();
        for (var i = 0; i < n; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            var row = table.Row(i);
            var mean = 0.0;
            for (var p = 0; p < j; p++)
            {
                var l = Math.Log(row[p]);
                data[(p * n) + i] = l;
                mean += w[p] * l;
            }

            for (var p = 0; p < j; p++)
            {
                data[(p * n) + i] -= mean;
            }
        }

        logScale = 1;
        var rootR = Math.Sqrt(1.0 / n);
        for (var p = 0; p < j; p++)
        {
            var col = data.AsSpan(p * n, n);
            var mean = 0.0;
            foreach (var v in col)
            {
                mean += v;
            }

            mean /= n;
            var scale = rootR * Math.Sqrt(w[p]);
            for (var i = 0; i < n; i++)
            {
                col[i] = (col[i] - mean) * scale;
            }

            logScale += w[p] * mean * mean;
        }

        return z;
    }
}

/// <summary>The result of a log-ratio analysis.</summary>
/// <param name="SingularValues">All min(J − 1, n − 1) singular values s_k of Z, descending.</param>
/// <param name="Inertia">s_k² / TV per dimension: the fraction of the total log-ratio variance it shows.</param>
/// <param name="TotalVariance">TV = Σ_j w_j var(clr_j) = Σ s_k², divisor <see cref="Divisor"/>.</param>
/// <param name="Divisor">Always <c>"n"</c>.</param>
/// <param name="Ids">The table's sample ids, or null.</param>
/// <param name="RowPrincipal">Row principal coordinates, n rows of d values.</param>
/// <param name="Parts">The part names.</param>
/// <param name="Weights">The part weights used.</param>
/// <param name="PartStandard">Part standard coordinates, J rows of d values.</param>
/// <param name="Contributions">Part contributions V², J rows of d values.</param>
public sealed record LogRatioAnalysisResult(
    IReadOnlyList<double> SingularValues,
    IReadOnlyList<double> Inertia,
    double TotalVariance,
    string Divisor,
    IReadOnlyList<string>? Ids,
    double[][] RowPrincipal,
    IReadOnlyList<string> Parts,
    IReadOnlyList<double> Weights,
    double[][] PartStandard,
    double[][] Contributions);
