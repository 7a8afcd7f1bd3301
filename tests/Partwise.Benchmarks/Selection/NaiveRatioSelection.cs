using MathNet.Numerics.LinearAlgebra;
using Partwise.Core.Tables;

namespace Partwise.Benchmarks.Selection;

/// <summary>One step of the naive selection: the candidate (p, q) over the augmented columns, or a forced ratio's index.</summary>
public sealed record NaiveStep(int P, int Q, int Forced, double Explained, double Procrustes);

/// <summary>
/// Stepwise ratio selection written as its definition (Greenacre 2019, Math. Geosci. 51:649-682), the way a user would
/// write it without sufficient statistics: for every candidate at every step, refit the least-squares regression of every
/// weighted clr column on the chosen ratio columns plus the candidate, and keep the candidate that leaves the least
/// residual. Explained = 1 − Σ_j w_j RSS_j / (n TV). Costs about J⁴ n per path. It shares no code with the fast path
/// (only the table type), so it serves as the reference the fast path is checked and timed against.
/// </summary>
public static class NaiveRatioSelection
{
    /// <summary>Runs the naive path with the same candidate set, order, tie rule (1e-9), dependence rule and stopping rule.</summary>
    /// <param name="table">A strictly positive table.</param>
    /// <param name="w">Part weights, Σ w = 1.</param>
    /// <param name="amalgamations">Named amalgamations as part index sets, in order (columns J, J + 1, …).</param>
    /// <param name="excluded">Per part, whether it is kept out of every candidate (null: none).</param>
    /// <param name="forcedColumns">Values (one per row) of forced ratios, added first in order.</param>
    /// <param name="maxRatios">The most ratios, forced included.</param>
    /// <param name="target">Stop at the first step that reaches this explained fraction.</param>
    public static IReadOnlyList<NaiveStep> Run(
        CompositionTable table,
        double[] w,
        IReadOnlyList<int[]> amalgamations,
        bool[]? excluded,
        IReadOnlyList<double[]> forcedColumns,
        int maxRatios,
        double target = 1.0)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(w);
        ArgumentNullException.ThrowIfNull(amalgamations);
        ArgumentNullException.ThrowIfNull(forcedColumns);
        int n = table.RowCount, j = table.PartCount, m = j + amalgamations.Count;
        excluded ??= new bool[j];

        // Augmented logs: ln x_j, then ln of each amalgamation's sum.
        var logs = new double[m][];
        for (var c = 0; c < m; c++)
        {
            logs[c] = new double[n];
        }

        for (var i = 0; i < n; i++)
        {
            var row = table.Row(i).ToArray();
            for (var c = 0; c < j; c++)
            {
                logs[c][i] = Math.Log(row[c]);
            }

            for (var a = 0; a < amalgamations.Count; a++)
            {
                logs[j + a][i] = Math.Log(amalgamations[a].Sum(c => row[c]));
            }
        }

        // Weighted clr columns, centred: Z_ij = √w_j (clr_ij − mean), the response of the regressions.
        var z = new double[j][];
        for (var c = 0; c < j; c++)
        {
            z[c] = new double[n];
        }

        for (var i = 0; i < n; i++)
        {
            var mean = 0.0;
            for (var c = 0; c < j; c++)
            {
                mean += w[c] * logs[c][i];
            }

            for (var c = 0; c < j; c++)
            {
                z[c][i] = Math.Sqrt(w[c]) * (logs[c][i] - mean);
            }
        }

        foreach (var col in z)
        {
            Centre(col);
        }

        var totalSs = z.Sum(col => col.Sum(v => v * v));
        var traceK0 = logs.Sum(col => Variance(col));
        var dependence = 1e-12 * traceK0;

        var usable = new bool[m];
        for (var c = 0; c < j; c++)
        {
            usable[c] = !excluded[c];
        }

        for (var a = 0; a < amalgamations.Count; a++)
        {
            usable[j + a] = amalgamations[a].All(c => !excluded[c]);
        }

        var candidates = new List<(int P, int Q)>();
        for (var p = 0; p < m; p++)
        {
            for (var q = p + 1; q < m; q++)
            {
                if (!usable[p] || !usable[q])
                {
                    continue;
                }

                var sp = p < j ? [p] : amalgamations[p - j];
                var sq = q < j ? [q] : amalgamations[q - j];
                if (!sp.Intersect(sq).Any())
                {
                    candidates.Add((p, q));
                }
            }
        }

        var chosen = new List<double[]>();
        var steps = new List<NaiveStep>();
        var explained = 0.0;
        for (var f = 0; f < forcedColumns.Count; f++)
        {
            var x = (double[])forcedColumns[f].Clone();
            Centre(x);
            chosen.Add(x);
            explained = 1 - (ResidualSs(chosen, z) / totalSs);
            steps.Add(new NaiveStep(-1, -1, f, explained, Procrustes(chosen, z)));
        }

        while (steps.Count < maxRatios && explained < target - 1e-12)
        {
            var fractions = new double[candidates.Count];
            var best = double.NegativeInfinity;
            for (var c = 0; c < candidates.Count; c++)
            {
                var x = Candidate(logs, candidates[c]);
                if (ResidualVariance(chosen, x) <= dependence)
                {
                    fractions[c] = double.NegativeInfinity;
                    continue;
                }

                var trial = new List<double[]>(chosen) { x };
                fractions[c] = 1 - (ResidualSs(trial, z) / totalSs);
                best = Math.Max(best, fractions[c]);
            }

            if (double.IsNegativeInfinity(best))
            {
                break;
            }

            var pick = Enumerable.Range(0, candidates.Count).First(c => fractions[c] >= best - 1e-9);
            chosen.Add(Candidate(logs, candidates[pick]));
            explained = fractions[pick];
            steps.Add(new NaiveStep(candidates[pick].P, candidates[pick].Q, -1, explained, Procrustes(chosen, z)));
        }

        return steps;
    }

    /// <summary>The explained fraction of a set of ratio columns: 1 − Σ_j RSS_j / Σ_j SS_j for the weighted clr columns.</summary>
    public static double Explained(CompositionTable table, double[] w, IReadOnlyList<double[]> ratioColumns)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(ratioColumns);
        var z = WeightedClr(table, w);
        var xs = ratioColumns.Select(col =>
        {
            var x = (double[])col.Clone();
            Centre(x);
            return x;
        }).ToList();
        var traceK0 = Enumerable.Range(0, table.PartCount).Sum(c => Variance([.. Enumerable.Range(0, table.RowCount).Select(i => Math.Log(table.Row(i)[c]))]));
        return 1 - (ResidualSs(xs, z, 1e-12 * traceK0) / z.Sum(col => col.Sum(v => v * v)));
    }

    /// <summary>Σ σ(Z'X) / (‖Z‖ ‖X‖) for centred columns (Gower 1975), by a full SVD.</summary>
    public static double Procrustes(CompositionTable table, double[] w, IReadOnlyList<double[]> ratioColumns)
    {
        ArgumentNullException.ThrowIfNull(ratioColumns);
        var xs = ratioColumns.Select(col =>
        {
            var x = (double[])col.Clone();
            Centre(x);
            return x;
        }).ToList();
        return Procrustes(xs, WeightedClr(table, w));
    }

    private static double[][] WeightedClr(CompositionTable table, double[] w)
    {
        int n = table.RowCount, j = table.PartCount;
        var z = new double[j][];
        for (var c = 0; c < j; c++)
        {
            z[c] = new double[n];
        }

        for (var i = 0; i < n; i++)
        {
            var row = table.Row(i);
            var mean = 0.0;
            for (var c = 0; c < j; c++)
            {
                mean += w[c] * Math.Log(row[c]);
            }

            for (var c = 0; c < j; c++)
            {
                z[c][i] = Math.Sqrt(w[c]) * (Math.Log(row[c]) - mean);
            }
        }

        foreach (var col in z)
        {
            Centre(col);
        }

        return z;
    }

    private static double[] Candidate(double[][] logs, (int P, int Q) c)
    {
        var x = new double[logs[0].Length];
        for (var i = 0; i < x.Length; i++)
        {
            x[i] = logs[c.P][i] - logs[c.Q][i];
        }

        Centre(x);
        return x;
    }

    // Σ_j RSS_j of the weighted clr columns regressed on the columns, by modified Gram–Schmidt with reorthogonalisation;
    // a column whose residual variance is at most `drop` adds no direction.
    private static double ResidualSs(List<double[]> columns, double[][] z, double drop = 0)
    {
        var basis = Orthonormal(columns, drop);
        var rss = 0.0;
        foreach (var col in z)
        {
            var r = (double[])col.Clone();
            foreach (var q in basis)
            {
                var d = Dot(q, r);
                for (var i = 0; i < r.Length; i++)
                {
                    r[i] -= d * q[i];
                }
            }

            rss += Dot(r, r);
        }

        return rss;
    }

    private static double ResidualVariance(List<double[]> columns, double[] x)
    {
        var basis = Orthonormal(columns, 0);
        var r = (double[])x.Clone();
        for (var pass = 0; pass < 2; pass++)
        {
            foreach (var q in basis)
            {
                var d = Dot(q, r);
                for (var i = 0; i < r.Length; i++)
                {
                    r[i] -= d * q[i];
                }
            }
        }

        return Dot(r, r) / r.Length;
    }

    private static List<double[]> Orthonormal(List<double[]> columns, double drop)
    {
        var basis = new List<double[]>();
        foreach (var col in columns)
        {
            var r = (double[])col.Clone();
            for (var pass = 0; pass < 2; pass++)
            {
                foreach (var q in basis)
                {
                    var d = Dot(q, r);
                    for (var i = 0; i < r.Length; i++)
                    {
                        r[i] -= d * q[i];
                    }
                }
            }

            var norm2 = Dot(r, r);
            if (norm2 / r.Length <= drop || norm2 == 0)
            {
                continue;
            }

            var inv = 1 / Math.Sqrt(norm2);
            for (var i = 0; i < r.Length; i++)
            {
                r[i] *= inv;
            }

            basis.Add(r);
        }

        return basis;
    }

    private static double Procrustes(List<double[]> xs, double[][] z)
    {
        var n = z[0].Length;
        var zm = Matrix<double>.Build.Dense(n, z.Length, (i, c) => z[c][i]);
        var xm = Matrix<double>.Build.Dense(n, xs.Count, (i, c) => xs[c][i]);
        var s = (zm.TransposeThisAndMultiply(xm)).Svd(computeVectors: false).S.Sum();
        return s / Math.Sqrt(zm.FrobeniusNorm() * zm.FrobeniusNorm() * xm.FrobeniusNorm() * xm.FrobeniusNorm());
    }

    private static void Centre(double[] x)
    {
        var mean = x.Average();
        for (var i = 0; i < x.Length; i++)
        {
            x[i] -= mean;
        }
    }

    private static double Variance(double[] x)
    {
        var mean = x.Average();
        return x.Sum(v => (v - mean) * (v - mean)) / x.Length;
    }

    private static double Dot(double[] a, double[] b)
    {
        var s = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            s += a[i] * b[i];
        }

        return s;
    }
}
