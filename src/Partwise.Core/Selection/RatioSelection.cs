using System.Globalization;
using Partwise.Core.Problems;
using Partwise.Core.Tables;

namespace Partwise.Core.Selection;

/// <summary>
/// Stepwise selection of the log-ratios that explain the most of a table's log-ratio variance (Greenacre 2019,
/// Math. Geosci. 51:649-682), computed from the sufficient statistics of the augmented logs in one pass over the data.
/// </summary>
/// <remarks>
/// <para>Variance explained by a set of ratios: regress every weighted clr column √w_j clr_j on the ratios (least squares,
/// row weights 1/n); explained = 1 − Σ_j w_j RSS_j / (n TV), TV = Σ_j w_j var(clr_j).</para>
/// <para>Algorithm: G = [ln x_1 … ln x_J, ln s_1 … ln s_m] (s_c the sum of amalgamation c's parts), centred;
/// K0 = G' D_r G; F = D_w − w w' on the part columns; N = K F K. A candidate e_p − e_q adds
/// (N_pp + N_qq − 2N_pq) / (K_pp + K_qq − 2K_pq) of variance; candidates with a denominator ≤ 1e-12 trace(K0) depend on the
/// chosen set and are skipped. After choosing b: u = K b, c = b'u, v = K F u; K ← K − u u'/c;
/// N ← N − (v u' + u v')/c + (u'F u) u u'/c². Cost: O(n M²) once for K0, then O(M²) per step for M = J + m.</para>
/// <para>Candidates: every pair of usable parts, every named amalgamation with a usable part not in it, and every two named
/// amalgamations without a common part. Order: columns in table order then the amalgamations in the order given; pairs by
/// first column then second; the lower column is the numerator. Candidates whose explained fraction is within 1e-9 of the
/// best tie, and the first of them wins, so the path is reproducible by any correct implementation.</para>
/// <para>Forced ratios (any kind) are added first in the order given. A pairwise or amalgamation ratio between parts and
/// named amalgamations is e_p − e_q over the columns; an amalgamation with an unnamed sum on a side adds that sum as a
/// column (tables only); a balance is its log-contrast over the part columns. A forced ratio whose residual variance is
/// ≤ 1e-12 trace(K0) · (b'b / 2) depends on those before it and is refused.</para>
/// <para>Stopping: after <see cref="RatioSelectionOptions.MaxRatios"/> ratios, at the first step whose cumulative fraction
/// reaches <see cref="RatioSelectionOptions.Explained"/> (within 1e-12; that step is included), or when no candidate is
/// independent of the chosen set.</para>
/// <para>Each step also reports the Procrustes correlation (Gower 1975, Psychometrika 40:33-51) between the samples in all
/// log-ratios (the weighted clr Z = G E) and in the chosen ratios X = G B: Σ σ_i(E'K0B) / √(trace(E'K0E) trace(B'K0B)).</para>
/// </remarks>
public static class RatioSelection
{
    /// <summary>
    /// Runs the selection on a strictly positive table (apply the zero policy first).
    /// </summary>
    /// <param name="table">n ≥ 2 rows, J ≥ 2 parts, all values &gt; 0.</param>
    /// <param name="weights">Part weights w (length J, positive, Σ w = 1), e.g. from <see cref="Variance.PartWeights.Resolve"/>.</param>
    /// <param name="options">Amalgamations, forced and excluded parts, and the stopping rule.</param>
    /// <param name="cancellationToken">Looked at once per block of 256 rows, per row of the initial statistics and per step; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>The path, the total variance (divisor n), the chosen set's graph and whether it is invertible.</returns>
    /// <exception cref="CompositionException">A zero cell (<c>/rows/i/j</c>), a bad amalgamation (<c>/amalgamations/name</c>),
    /// exclusion (<c>/exclude/i</c>, or <c>/exclude</c> when fewer than two parts remain), forced ratio (<c>/force/i</c>;
    /// <see cref="ProblemTypes.DependentRatio"/> when it depends on the ratios before it), stopping option
    /// (<c>/stop/maxRatios</c>, <c>/stop/explained</c>), or data without log-ratio variance (<c>/rows</c>).</exception>
    /// <exception cref="ArgumentException">Weights of the wrong length, not positive, or not summing to 1.</exception>
    public static RatioSelectionResult Run(CompositionTable table, double[] weights, RatioSelectionOptions options, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var inputs = SelectionInputs.Resolve(table.Parts, weights, options, allowAddedSums: true);
        PositiveTable.Require(table);
        var k0 = AugmentedGram.Compute(table, inputs.Columns.Sums, cancellationToken);
        return StepwiseSelection.Run(inputs, k0, weights, "/rows", cancellationToken);
    }

    /// <summary>
    /// Runs the same selection from second moments instead of a table: since centring and the divisor only scale K0
    /// (K0 = covariance · (n − 1) / n), the path is the one the table would give.
    /// </summary>
    /// <param name="moments">Names: the J parts, then the named amalgamations of <paramref name="options"/> in order; their
    /// covariance (divisor n − 1) of ln x_j and of ln of each amalgamation's sum; the count n ≥ 2.</param>
    /// <param name="weights">Part weights for the first J names (positive, Σ w = 1): <c>equal</c> or given ones, since mean
    /// proportions need the table.</param>
    /// <param name="options">As for a table; a forced amalgamation ratio can only use parts and named amalgamations.</param>
    /// <param name="cancellationToken">Looked at per row of the initial statistics and per step; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.InvalidMoments"/> for names that do not match
    /// (<c>/moments/names/i</c>), a covariance that is not square, symmetric within 1e-9 of its largest diagonal value, or
    /// positive semi-definite (eigenvalues ≥ −1e-10 trace) (<c>/moments/covariance</c>), or a count below 2
    /// (<c>/moments/count</c>); <see cref="ProblemTypes.NonFiniteValue"/> at <c>/moments/covariance/i/j</c>; and the
    /// option problems of the table overload.</exception>
    public static RatioSelectionResult Run(SelectionMoments moments, double[] weights, RatioSelectionOptions options, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(moments);
        ArgumentNullException.ThrowIfNull(options);
        var parts = MomentParts(moments, options.Amalgamations ?? []);
        var inputs = SelectionInputs.Resolve(parts, weights, options, allowAddedSums: false);
        var k0 = MomentGram(moments, parts.Length + (options.Amalgamations?.Count ?? 0));
        return StepwiseSelection.Run(inputs, k0, weights, "/moments/covariance", cancellationToken);
    }

    private static string[] MomentParts(SelectionMoments moments, IReadOnlyList<NamedAmalgamation> amalgamations)
    {
        var names = moments.Names ?? throw new CompositionException(ProblemTypes.InvalidMoments, "/moments/names", "The moments need their names.");
        var j = names.Count - amalgamations.Count;
        if (j < 2)
        {
            throw new CompositionException(
                ProblemTypes.InvalidMoments,
                "/moments/names",
                $"The names must be the parts (at least two) and then the {amalgamations.Count} amalgamation(s); there are {names.Count} names.");
        }

        for (var a = 0; a < amalgamations.Count; a++)
        {
            if (!string.Equals(names[j + a], amalgamations[a]?.Name, StringComparison.Ordinal))
            {
                throw new CompositionException(
                    ProblemTypes.InvalidMoments,
                    string.Create(CultureInfo.InvariantCulture, $"/moments/names/{j + a}"),
                    $"After the parts, the names must be the amalgamations in their order: expected '{amalgamations[a]?.Name}', found '{names[j + a]}'.");
            }
        }

        var seen = new HashSet<string>(StringComparer.Ordinal);
        var parts = new string[j];
        for (var i = 0; i < j; i++)
        {
            var name = names[i];
            var pointer = string.Create(CultureInfo.InvariantCulture, $"/moments/names/{i}");
            if (string.IsNullOrWhiteSpace(name))
            {
                throw new CompositionException(ProblemTypes.InvalidMoments, pointer, "A part name must not be empty.");
            }

            if (!seen.Add(name))
            {
                throw new CompositionException(ProblemTypes.InvalidMoments, pointer, $"The name '{name}' appears more than once.");
            }

            parts[i] = name;
        }

        return parts;
    }

    private static double[] MomentGram(SelectionMoments moments, int m)
    {
        const string pointer = "/moments/covariance";
        if (moments.Count < 2)
        {
            throw new CompositionException(ProblemTypes.InvalidMoments, "/moments/count", "The moments must come from at least two samples.");
        }

        var cov = moments.Covariance;
        if (cov is null || cov.Count != m)
        {
            throw new CompositionException(ProblemTypes.InvalidMoments, pointer, $"The covariance must be {m} × {m}, one row and column per name.");
        }

        var k0 = new double[m * m];
        var maxDiagonal = 0.0;
        for (var r = 0; r < m; r++)
        {
            var row = cov[r];
            if (row is null || row.Length != m)
            {
                throw new CompositionException(ProblemTypes.InvalidMoments, string.Create(CultureInfo.InvariantCulture, $"{pointer}/{r}"), $"Each row of the covariance must have {m} values.");
            }

            for (var c = 0; c < m; c++)
            {
                if (!double.IsFinite(row[c]))
                {
                    throw new CompositionException(ProblemTypes.NonFiniteValue, string.Create(CultureInfo.InvariantCulture, $"{pointer}/{r}/{c}"), "The value is not a finite number.");
                }

                k0[(r * m) + c] = row[c];
            }

            maxDiagonal = Math.Max(maxDiagonal, row[r]);
        }

        for (var r = 0; r < m; r++)
        {
            for (var c = r + 1; c < m; c++)
            {
                double a = k0[(r * m) + c], b = k0[(c * m) + r];
                if (Math.Abs(a - b) > 1e-9 * maxDiagonal)
                {
                    throw new CompositionException(
                        ProblemTypes.InvalidMoments,
                        pointer,
                        string.Create(CultureInfo.InvariantCulture, $"The covariance is not symmetric: entries [{r}][{c}] and [{c}][{r}] differ."));
                }

                var mean = (a + b) / 2;
                k0[(r * m) + c] = mean;
                k0[(c * m) + r] = mean;
            }
        }

        var trace = 0.0;
        for (var r = 0; r < m; r++)
        {
            trace += k0[(r * m) + r];
        }

        var eigen = new double[m];
        SymmetricEigenvalues.Compute((double[])k0.Clone(), m, eigen, new double[3 * m]);
        var smallest = eigen.Min();
        if (smallest < -1e-10 * Math.Abs(trace) || trace < 0)
        {
            throw new CompositionException(
                ProblemTypes.InvalidMoments,
                pointer,
                string.Create(CultureInfo.InvariantCulture, $"The covariance is not positive semi-definite (smallest eigenvalue {smallest:G4}, trace {trace:G4})."));
        }

        // K0 = G' D_r G has divisor n; the covariance has n − 1.
        var scale = (moments.Count - 1.0) / moments.Count;
        for (var i = 0; i < k0.Length; i++)
        {
            k0[i] *= scale;
        }

        return k0;
    }
}
