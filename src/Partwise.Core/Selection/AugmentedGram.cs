using System.Numerics;
using System.Runtime.InteropServices;
using Partwise.Core.Tables;

namespace Partwise.Core.Selection;

/// <summary>
/// K0 = G' D_r G for the augmented logs G (centred with row weights r = 1/n): the covariance, divisor n, of ln x_j and of
/// ln of each sum column (Greenacre 2019, Math. Geosci. 51:649-682). This is the one pass over the data that stepwise
/// selection and ratio-set evaluation need.
/// </summary>
internal static class AugmentedGram
{
    private const int BlockRows = 256;

    /// <summary>
    /// The (J + s) × (J + s) row-major K0 of a strictly positive table for the part columns and the given sum columns.
    /// </summary>
    /// <remarks>
    /// Rows are taken in blocks of 256: each block's logs, shifted by the first row's logs so that the one-pass
    /// covariance does not cancel, are stored column by column and every pair of columns is a contiguous dot product.
    /// Memory: the (J + s)² result and one block, whatever n is.
    /// </remarks>
    public static double[] Compute(CompositionTable table, IReadOnlyList<int[]> sums)
    {
        int n = table.RowCount, j = table.PartCount, m = j + sums.Count;
        var block = new double[m * BlockRows];
        var shift = new double[m];
        var total = new double[m];
        var cross = new double[m * m];
        FillLogs(table, 0, 1, sums, block);
        for (var c = 0; c < m; c++)
        {
            shift[c] = block[c * BlockRows];
        }

        for (var start = 0; start < n; start += BlockRows)
        {
            var len = Math.Min(BlockRows, n - start);
            FillLogs(table, start, len, sums, block);
            for (var c = 0; c < m; c++)
            {
                var col = block.AsSpan(c * BlockRows, len);
                var s = shift[c];
                var acc = 0.0;
                for (var r = 0; r < col.Length; r++)
                {
                    var v = col[r] - s;
                    col[r] = v;
                    acc += v;
                }

                total[c] += acc;
            }

            for (var p = 0; p < m; p++)
            {
                var colP = block.AsSpan(p * BlockRows, len);
                var row = p * m;
                for (var q = p; q < m; q++)
                {
                    cross[row + q] += Dot(colP, block.AsSpan(q * BlockRows, len));
                }
            }
        }

        // K0 = Σ (g − c)(g − c)' / n − (ḡ − c)(ḡ − c)', the covariance about the mean from sums about the shift c.
        for (var p = 0; p < m; p++)
        {
            var dp = total[p] / n;
            for (var q = p; q < m; q++)
            {
                var v = (cross[(p * m) + q] / n) - (dp * (total[q] / n));
                cross[(p * m) + q] = v;
                cross[(q * m) + p] = v;
            }
        }

        return cross;
    }

    private static void FillLogs(CompositionTable table, int start, int len, IReadOnlyList<int[]> sums, double[] block)
    {
        var j = table.PartCount;
        var values = table.Values;
        for (var r = 0; r < len; r++)
        {
            var offset = (start + r) * j;
            for (var k = 0; k < j; k++)
            {
                block[(k * BlockRows) + r] = Math.Log(values[offset + k]);
            }

            for (var a = 0; a < sums.Count; a++)
            {
                var set = sums[a];
                var s = 0.0;
                foreach (var k in set)
                {
                    s += values[offset + k];
                }

                block[((j + a) * BlockRows) + r] = Math.Log(s);
            }
        }
    }

    private static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var va = MemoryMarshal.Cast<double, Vector<double>>(a);
        var vb = MemoryMarshal.Cast<double, Vector<double>>(b);
        var acc = Vector<double>.Zero;
        for (var i = 0; i < va.Length; i++)
        {
            acc += va[i] * vb[i];
        }

        var sum = Vector.Sum(acc);
        for (var i = va.Length * Vector<double>.Count; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }
}
