using MathNet.Numerics.LinearAlgebra;
using Partwise.Core.Selection;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class ResidualGramTests
{
    // METHODS.md "Stepwise ratio selection" items 2-4: after adding ratios B the rank-one updates must leave
    // K = K0 − K0 B (B'K0B)⁻¹ B'K0 (the Gram of the residuals of G on the chosen columns) and N = K F K with
    // F = (I − w1') D_w (I − 1w') on the part columns; TV = trace(E'K0E). Checked against those closed forms.
    [Fact]
    public void RankOneUpdatesLeaveTheResidualGramAndItsSandwich()
    {
        var table = SeededAmalgamations.Structured(71, 60, 6);
        var amalgamations = SeededAmalgamations.Indices(table, SeededAmalgamations.Amalgamations(71, 6, 2));
        var w = SeededAmalgamations.Unequal(71, 6);
        var k0 = AugmentedGram.Compute(table, amalgamations);
        const int m = 8;
        var gram = new ResidualGram(k0, m, w);
        (int, double)[][] added = [[(0, 1.0), (3, -1.0)], [(6, 1.0), (1, -1.0)], [(2, 0.5), (4, 0.5), (5, -1.0)]];
        foreach (var b in added)
        {
            gram.Add(b);
        }

        var k0m = Matrix<double>.Build.Dense(m, m, (r, c) => k0[(r * m) + c]);
        var bm = Matrix<double>.Build.Dense(m, added.Length);
        for (var c = 0; c < added.Length; c++)
        {
            foreach (var (col, v) in added[c])
            {
                bm[col, c] = v;
            }
        }

        var kb = k0m * bm;
        var expectedK = k0m - (kb * (bm.Transpose() * kb).Inverse() * kb.Transpose());
        var e = Matrix<double>.Build.Dense(m, 6);
        for (var r = 0; r < 6; r++)
        {
            for (var c = 0; c < 6; c++)
            {
                e[r, c] = ((r == c ? 1 : 0) - w[r]) * Math.Sqrt(w[c]);
            }
        }

        var f = e * e.Transpose();
        var expectedN = expectedK * f * expectedK;
        var scale = k0m.Diagonal().Sum();
        for (var i = 0; i < m * m; i++)
        {
            Tolerance.Close(expectedK[i / m, i % m], gram.K[i], 1e-12 * scale, 0, $"K[{i}]");
            Tolerance.Close(expectedN[i / m, i % m], gram.N[i], 1e-12 * scale, 0, $"N[{i}]");
        }

        Tolerance.Close((e.Transpose() * k0m * e).Trace(), gram.TotalVariance, 1e-14, 1e-12, "TV");
    }

    // The Gram of the augmented logs against a direct centred cross-product (divisor n).
    [Fact]
    public void AugmentedGramIsTheCovarianceOfTheLogsAndSumLogsWithDivisorN()
    {
        var table = SeededCompositions.Table(72, 700, 5); // more than two row blocks
        int[][] sums = [[0, 2], [1, 3, 4]];
        var k0 = AugmentedGram.Compute(table, sums);
        var cols = new double[7][];
        for (var c = 0; c < 7; c++)
        {
            cols[c] = [.. Enumerable.Range(0, 700).Select(i => c < 5 ? Math.Log(table.Row(i)[c]) : Math.Log(sums[c - 5].Sum(p => table.Row(i)[p])))];
        }

        for (var a = 0; a < 7; a++)
        {
            for (var b = 0; b < 7; b++)
            {
                double ma = cols[a].Average(), mb = cols[b].Average();
                var cov = Enumerable.Range(0, 700).Sum(i => (cols[a][i] - ma) * (cols[b][i] - mb)) / 700;
                Tolerance.Close(cov, k0[(a * 7) + b], 1e-13, 1e-11, $"K0[{a},{b}]");
            }
        }
    }
}
