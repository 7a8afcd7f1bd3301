using MathNet.Numerics.LinearAlgebra;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Tables;

namespace Partwise.Core.Selection;

/// <summary>
/// How much of a table's log-ratio variance an analyst's own ratio set explains, as a whole and ratio by ratio
/// (Greenacre 2019, Math. Geosci. 51:649-682), with the Procrustes correlation of the set (Gower 1975, Psychometrika 40:33-51).
/// </summary>
public static class RatioSetEvaluation
{
    /// <summary>
    /// Evaluates a ratio set on a strictly positive table.
    /// </summary>
    /// <param name="table">n rows, J ≥ 2 parts, all values &gt; 0 (apply the zero policy first).</param>
    /// <param name="ratios">k ≥ 1 ratios of any kinds over the table's parts.</param>
    /// <param name="weights">Part weights w (length J, positive, Σ w = 1).</param>
    /// <param name="cancellationToken">Looked at once per block of 256 rows, per row of the initial statistics and per ratio; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>
    /// explained = 1 − Σ_j w_j RSS_j / (n TV), regressing every weighted clr column on all k ratio columns;
    /// Procrustes r = Σ σ_i(E'K0B) / √(TV · trace(B'K0B)) (0 when no ratio varies); rank = the dimension the ratio columns
    /// span on these data; invertible = <see cref="RatioReconstruction.IsInvertible"/>; per ratio, explainedAlone (that
    /// ratio by itself) and uniqueContribution = explained(all) − explained(all but that ratio), 0 for a ratio that the
    /// others can stand in for.
    /// </returns>
    /// <remarks>
    /// All from the Gram of the augmented logs K0 (one pass over the data) and the k × k matrices S = B'K0B and
    /// C = B'N0B, N0 = K0 F K0 (the Procrustes sum from an SVD of E'K0B). A ratio is independent of those before it when its residual variance exceeds
    /// 1e-12 trace(K0) · (b'b / 2); the independent ones I give explained = trace(S_II⁻¹ C_II) / TV, and the unique
    /// contribution of i ∈ I is (S_II⁻¹ C_II S_II⁻¹)_ii / (S_II⁻¹)_ii / TV unless a dependent ratio leans on it.
    /// Cost: O(n M²) for K0 plus O(k³ + k M²).
    /// </remarks>
    /// <exception cref="CompositionException">A zero cell (<c>/rows/i/j</c>), no ratios (<c>/ratios</c>), or data without
    /// log-ratio variance (<see cref="ProblemTypes.NoVariation"/> at <c>/rows</c>).</exception>
    /// <exception cref="ArgumentException">Weights of the wrong length, not positive, or not summing to 1; ratios with
    /// indices outside the table.</exception>
    public static RatioSetEvaluationResult Evaluate(CompositionTable table, IReadOnlyList<LogRatio> ratios, double[] weights, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(ratios);
        ArgumentNullException.ThrowIfNull(weights);
        var j = table.PartCount;
        SelectionInputs.CheckWeights(weights, j);
        if (ratios.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/ratios", "At least one ratio is needed.");
        }

        foreach (var r in ratios)
        {
            if (r is null || r.Numerator.Concat(r.Denominator).Any(c => c < 0 || c >= j))
            {
                throw new ArgumentException("Every ratio must refer to parts of the table.", nameof(ratios));
            }
        }

        PositiveTable.Require(table);
        var columns = new AugmentedColumns(j, []);
        foreach (var r in ratios.Where(r => r.Kind == RatioKind.Amalgamation))
        {
            columns.FindOrAdd(r.Numerator);
            columns.FindOrAdd(r.Denominator);
        }

        var m = columns.Count;
        var k0 = AugmentedGram.Compute(table, columns.Sums, cancellationToken);
        var gram = new ResidualGram(k0, m, weights, cancellationToken);
        var tv = gram.TotalVariance;
        if (!(tv > 1e-12 * gram.Trace0))
        {
            throw new CompositionException(ProblemTypes.NoVariation, "/rows", "The compositions have no log-ratio variance (they are all proportional), so there is nothing to explain.");
        }

        var k = ratios.Count;
        var coefficients = ratios.Select(r => columns.Coefficients(r)!).ToArray();
        var s = new double[k, k];
        var c = new double[k, k];
        for (var a = 0; a < k; a++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            for (var b = a; b < k; b++)
            {
                s[a, b] = s[b, a] = Bilinear(k0, m, coefficients[a], coefficients[b]);
                c[a, b] = c[b, a] = Bilinear(gram.N, m, coefficients[a], coefficients[b]);
            }
        }

        var tolerances = coefficients.Select(b => gram.Tolerance(b.Sum(t => t.Value * t.Value))).ToArray();
        var independent = Independent(s, tolerances);
        var rank = independent.Count;
        var unique = new double[k];
        var explained = 0.0;
        if (rank > 0)
        {
            var sII = Matrix<double>.Build.Dense(rank, rank, (a, b) => s[independent[a], independent[b]]);
            var cII = Matrix<double>.Build.Dense(rank, rank, (a, b) => c[independent[a], independent[b]]);
            var inverse = sII.Inverse();
            explained = (inverse * cII).Trace() / tv;
            var sandwich = inverse * cII * inverse;
            var leaned = LeanedOn(s, independent, inverse, tolerances);
            for (var a = 0; a < rank; a++)
            {
                if (!leaned[a])
                {
                    unique[independent[a]] = Math.Clamp(sandwich[a, a] / inverse[a, a] / tv, 0, 1);
                }
            }
        }

        var perRatio = new RatioContribution[k];
        var traceS = 0.0;
        for (var a = 0; a < k; a++)
        {
            traceS += s[a, a];
            var alone = s[a, a] > tolerances[a] ? Math.Clamp(c[a, a] / s[a, a] / tv, 0, 1) : 0;
            perRatio[a] = new RatioContribution(ratios[a], ratios[a].Label, alone, unique[a]);
        }

        var procrustes = 0.0;
        if (traceS > 0)
        {
            // Σ σ(E'K0B) from an SVD of the J × k matrix itself, not from eigenvalues of B'N0B: a dependent set has zero
            // singular values, whose square roots would carry errors of order √ε.
            var a = Matrix<double>.Build.Dense(j, k);
            var kb = new double[m];
            for (var r = 0; r < k; r++)
            {
                cancellationToken.ThrowIfCancellationRequested();
                Array.Clear(kb);
                foreach (var (col, val) in coefficients[r])
                {
                    for (var row = 0; row < m; row++)
                    {
                        kb[row] += val * k0[(row * m) + col];
                    }
                }

                var wkb = 0.0;
                for (var p = 0; p < j; p++)
                {
                    wkb += weights[p] * kb[p];
                }

                for (var p = 0; p < j; p++)
                {
                    a[p, r] = Math.Sqrt(weights[p]) * (kb[p] - wkb);
                }
            }

            procrustes = Math.Clamp(a.Svd(computeVectors: false).S.Sum() / Math.Sqrt(tv * traceS), 0, 1);
        }

        return new RatioSetEvaluationResult(
            tv,
            "n",
            Math.Clamp(explained, 0, 1),
            procrustes,
            rank,
            RatioReconstruction.IsInvertible(table.Parts, ratios),
            perRatio);
    }

    private static double Bilinear(double[] a, int m, (int Column, double Value)[] x, (int Column, double Value)[] y)
    {
        var sum = 0.0;
        foreach (var (c1, v1) in x)
        {
            foreach (var (c2, v2) in y)
            {
                sum += v1 * v2 * a[(c1 * m) + c2];
            }
        }

        return sum;
    }

    // Ratios independent of those before them, in order: Gram–Schmidt on S with the dependence tolerance.
    private static List<int> Independent(double[,] s, double[] tolerances)
    {
        var k = tolerances.Length;
        var residual = (double[,])s.Clone();
        var result = new List<int>();
        for (var i = 0; i < k; i++)
        {
            var d = residual[i, i];
            if (!(d > tolerances[i]))
            {
                continue;
            }

            result.Add(i);
            var column = new double[k];
            for (var a = 0; a < k; a++)
            {
                column[a] = residual[a, i];
            }

            for (var a = 0; a < k; a++)
            {
                for (var b = 0; b < k; b++)
                {
                    residual[a, b] -= column[a] * column[b] / d;
                }
            }
        }

        return result;
    }

    // leaned[a]: some dependent ratio d needs independent ratio a, i.e. x_d keeps a residual above its tolerance on the
    // other independent ones, so the set without a spans the same space and a adds nothing uniquely.
    private static bool[] LeanedOn(double[,] s, List<int> independent, Matrix<double> inverse, double[] tolerances)
    {
        var rank = independent.Count;
        var leaned = new bool[rank];
        var k = tolerances.Length;
        for (var d = 0; d < k; d++)
        {
            if (independent.Contains(d))
            {
                continue;
            }

            var sId = Vector<double>.Build.Dense(rank, a => s[independent[a], d]);
            var alpha = inverse * sId;
            for (var a = 0; a < rank; a++)
            {
                if (alpha[a] * alpha[a] / inverse[a, a] > tolerances[d])
                {
                    leaned[a] = true;
                }
            }
        }

        return leaned;
    }
}

/// <summary>The evaluation of a ratio set.</summary>
/// <param name="TotalVariance">TV = Σ_j w_j var(clr_j), divisor <see cref="Divisor"/>.</param>
/// <param name="Divisor">Always <c>"n"</c>.</param>
/// <param name="Explained">The fraction of TV the whole set explains, in [0, 1].</param>
/// <param name="Procrustes">The Procrustes correlation between the samples in all log-ratios and in the set, in [0, 1].</param>
/// <param name="Rank">The dimension the ratio columns span on the data (≤ the number of ratios).</param>
/// <param name="Invertible">Whether the set determines the composition.</param>
/// <param name="PerRatio">One entry per ratio, in the order given.</param>
public sealed record RatioSetEvaluationResult(
    double TotalVariance,
    string Divisor,
    double Explained,
    double Procrustes,
    int Rank,
    bool Invertible,
    IReadOnlyList<RatioContribution> PerRatio);

/// <summary>What one ratio of a set explains.</summary>
/// <param name="Ratio">The ratio.</param>
/// <param name="Label">Its label.</param>
/// <param name="ExplainedAlone">The fraction of TV it explains by itself, in [0, 1].</param>
/// <param name="UniqueContribution">The set's explained fraction less that of the set without this ratio, in [0, 1].</param>
public sealed record RatioContribution(LogRatio Ratio, string Label, double ExplainedAlone, double UniqueContribution);
