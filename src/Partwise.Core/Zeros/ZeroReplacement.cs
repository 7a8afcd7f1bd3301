using Partwise.Core.Problems;
using Partwise.Core.Tables;

namespace Partwise.Core.Zeros;

/// <summary>One replaced cell: 0-based row, part, and the value it now has (in the table's own units).</summary>
/// <param name="Row">0-based row index.</param>
/// <param name="PartIndex">0-based part index.</param>
/// <param name="Part">The part's name.</param>
/// <param name="Value">The replacement, in the units of the returned table.</param>
public sealed record ImputedCell(int Row, int PartIndex, string Part, double Value);

/// <summary>A table with no zeros left, and every cell that was replaced to get there.</summary>
/// <param name="Table">Strictly positive; each row keeps its original sum.</param>
/// <param name="Imputed">Replaced cells in row-major order; empty under <see cref="RejectZeros"/>.</param>
public sealed record ZeroResult(CompositionTable Table, IReadOnlyList<ImputedCell> Imputed);

/// <summary>Applies a <see cref="ZeroPolicy"/> so that every cell is strictly positive and logs exist.</summary>
public static class ZeroReplacement
{
    private const int MaxReported = 20;

    /// <summary>
    /// Applies <paramref name="policy"/> to <paramref name="table"/>. Rows keep their own sums (c for
    /// multiplicative, N for counts), so closure afterwards gives the same result as closing first.
    /// </summary>
    /// <param name="table">A validated table (non-negative, finite).</param>
    /// <param name="policy">Reject, multiplicative or Bayesian-multiplicative.</param>
    /// <param name="pointer">JSON pointer of the zero policy in the request, usually <c>/zeros</c>.</param>
    /// <exception cref="CompositionException">
    /// A zero under reject (pointing at each cell), an all-zero row, a zero in a part with no detection limit,
    /// replacements that would use up a row's total, or non-integer counts for the Bayesian policy.
    /// </exception>
    public static ZeroResult Apply(CompositionTable table, ZeroPolicy policy, string pointer = "/zeros")
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(policy);
        return policy switch
        {
            RejectZeros => RejectAll(table),
            MultiplicativeReplacement m => Multiplicative(table, m, pointer),
            BayesianMultiplicativeReplacement b => BayesianMultiplicative(table, b, pointer),
            _ => throw new ArgumentException($"Unknown zero policy {policy.GetType().Name}.", nameof(policy)),
        };
    }

    private static ZeroResult RejectAll(CompositionTable table)
    {
        var errors = new List<ProblemError>();
        var values = table.Values;
        var j = table.PartCount;
        var count = 0;
        for (var k = 0; k < values.Length; k++)
        {
            if (values[k] == 0)
            {
                count++;
                if (errors.Count < MaxReported)
                {
                    errors.Add(new ProblemError($"/rows/{k / j}/{k % j}", $"Part '{table.Parts[k % j]}' is zero in row {k / j}; log-ratios of zero are undefined. Choose a zero policy (zeros.method) or remove it."));
                }
            }
        }

        return count == 0
            ? new ZeroResult(table, [])
            : throw new CompositionException(ProblemTypes.ZeroValue, $"{count} zero cell(s) under the reject policy.", errors);
    }

    /// <summary>
    /// δ_j = f·DL_j for each zero part j; every non-zero x_k becomes x_k (1 − Σ δ_j / c), c the row sum
    /// (Martín-Fernández et al. 2003, eq. 4). Ratios among the non-zero parts are kept exactly.
    /// </summary>
    private static ZeroResult Multiplicative(CompositionTable table, MultiplicativeReplacement policy, string pointer)
    {
        if (!double.IsFinite(policy.Fraction) || policy.Fraction <= 0 || policy.Fraction > 1)
        {
            throw new CompositionException(ProblemTypes.InvalidZeroPolicy, pointer + "/fraction", "The fraction of the detection limit must be in (0, 1]; 0.65 is common practice.");
        }

        var j = table.PartCount;
        var limits = new double[j];
        Array.Fill(limits, double.NaN);
        if (policy.LimitForAll is { } all)
        {
            if (!double.IsFinite(all) || all <= 0)
            {
                throw new CompositionException(ProblemTypes.InvalidZeroPolicy, pointer + "/detectionLimits", "A detection limit must be a positive finite number.");
            }

            Array.Fill(limits, all);
        }

        if (policy.LimitsByPart is { } map)
        {
            foreach (var (part, limit) in map)
            {
                var at = $"{pointer}/detectionLimits/{JsonPointer.Escape(part)}";
                var index = table.IndexOf(part);
                if (index < 0)
                {
                    throw new CompositionException(ProblemTypes.UnknownPart, at, $"The table has no part named '{part}'.");
                }

                if (!double.IsFinite(limit) || limit <= 0)
                {
                    throw new CompositionException(ProblemTypes.InvalidZeroPolicy, at, "A detection limit must be a positive finite number.");
                }

                limits[index] = limit;
            }
        }

        var values = (double[])table.Values.Clone();
        var imputed = new List<ImputedCell>();
        for (var i = 0; i < table.RowCount; i++)
        {
            var row = values.AsSpan(i * j, j);
            double c = 0, replaced = 0;
            var zeros = 0;
            for (var k = 0; k < j; k++)
            {
                c += row[k];
                if (row[k] == 0)
                {
                    if (double.IsNaN(limits[k]))
                    {
                        throw new CompositionException(ProblemTypes.InvalidZeroPolicy, $"/rows/{i}/{k}", $"Part '{table.Parts[k]}' is zero in row {i} but has no detection limit; give one in {pointer}/detectionLimits.");
                    }

                    if (policy.Fraction * limits[k] == 0)
                    {
                        // f · DL of two tiny positive doubles can underflow to 0, whose log is −∞.
                        throw new CompositionException(ProblemTypes.InvalidZeroPolicy, pointer + "/fraction", $"The replacement of part '{table.Parts[k]}' (fraction × detection limit) is below the smallest positive double; use a larger fraction or detection limit.");
                    }

                    replaced += policy.Fraction * limits[k];
                    zeros++;
                }
            }

            if (zeros == 0)
            {
                continue;
            }

            if (c == 0)
            {
                throw new CompositionException(ProblemTypes.ZeroValue, $"/rows/{i}", $"Row {i} is entirely zero; it holds no composition.");
            }

            if (replaced >= c)
            {
                throw new CompositionException(ProblemTypes.InvalidZeroPolicy, $"/rows/{i}", $"The replacements in row {i} ({replaced:G6}) reach the row's total ({c:G6}); the detection limits are too large for this row's units.");
            }

            var shrink = 1 - (replaced / c);
            for (var k = 0; k < j; k++)
            {
                if (row[k] == 0)
                {
                    row[k] = policy.Fraction * limits[k];
                    imputed.Add(new ImputedCell(i, k, table.Parts[k], row[k]));
                }
                else
                {
                    row[k] *= shrink;
                    if (row[k] == 0)
                    {
                        // A subnormal value times the shrink factor can round to 0, whose log is −∞.
                        throw new CompositionException(ProblemTypes.InvalidZeroPolicy, $"/rows/{i}/{k}", $"Part '{table.Parts[k]}' in row {i} is too small to keep a positive value after the zeros of the row are replaced.");
                    }
                }
            }
        }

        return new ZeroResult(table.WithValues(values), imputed);
    }

    /// <summary>
    /// Row total N, t_j = 1/J, strength s by prior; zero cells r_j = t_j s / (N + s), non-zero
    /// r_j = (n_j / N)(1 − Σ_zero t_k s / (N + s)) (Martín-Fernández et al. 2015, §3). The proportions r are
    /// returned times N, so each row keeps its count total.
    /// </summary>
    private static ZeroResult BayesianMultiplicative(CompositionTable table, BayesianMultiplicativeReplacement policy, string pointer)
    {
        var j = table.PartCount;
        var values = (double[])table.Values.Clone();
        for (var k = 0; k < values.Length; k++)
        {
            if (values[k] != Math.Floor(values[k]))
            {
                throw new CompositionException(ProblemTypes.InvalidZeroPolicy, $"/rows/{k / j}/{k % j}", $"The Bayesian-multiplicative policy ({pointer}) takes counts only, and this value is not an integer.");
            }
        }

        var imputed = new List<ImputedCell>();
        var t = 1.0 / j;
        for (var i = 0; i < table.RowCount; i++)
        {
            var row = values.AsSpan(i * j, j);
            double n = 0;
            var zeros = 0;
            foreach (var v in row)
            {
                n += v;
                zeros += v == 0 ? 1 : 0;
            }

            if (zeros == 0)
            {
                continue;
            }

            if (n == 0)
            {
                throw new CompositionException(ProblemTypes.ZeroValue, $"/rows/{i}", $"Row {i} has no counts at all; it holds no composition.");
            }

            var s = policy.Prior switch
            {
                CountPrior.BayesLaplace => j,
                CountPrior.Jeffreys => j / 2.0,
                CountPrior.Perks => 1.0,
                _ => Math.Sqrt(n),
            };
            var zeroShare = t * s / (n + s);
            var keep = 1 - (zeros * zeroShare);
            for (var k = 0; k < j; k++)
            {
                if (row[k] == 0)
                {
                    row[k] = n * zeroShare;
                    imputed.Add(new ImputedCell(i, k, table.Parts[k], row[k]));
                }
                else
                {
                    row[k] *= keep;
                }
            }
        }

        return new ZeroResult(table.WithValues(values), imputed);
    }
}
