using System.Buffers;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
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
    public static double[] Compute(CompositionTable table, IReadOnlyList<int[]> sums, CancellationToken cancellationToken = default)
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
            // A block is 256 M² / 2 products: look once per block.
            cancellationToken.ThrowIfCancellationRequested();
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
                var row = cross.AsSpan(p * m, m);
                var q = p;
                for (; q + 3 < m; q += 4)
                {
                    DenseKernels.Dot4(
                        colP,
                        block.AsSpan(q * BlockRows, len),
                        block.AsSpan((q + 1) * BlockRows, len),
                        block.AsSpan((q + 2) * BlockRows, len),
                        block.AsSpan((q + 3) * BlockRows, len),
                        row.Slice(q, 4));
                }

                for (; q < m; q++)
                {
                    row[q] += DenseKernels.Dot(colP, block.AsSpan(q * BlockRows, len));
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
        var rowMajor = table.Values.AsSpan(start * j, len * j);
        var logs = ArrayPool<double>.Shared.Rent(len * j);
        try
        {
            VectorLog(rowMajor, logs.AsSpan(0, len * j));
            for (var r = 0; r < len; r++)
            {
                var offset = r * j;
                for (var k = 0; k < j; k++)
                {
                    block[(k * BlockRows) + r] = logs[offset + k];
                }

                var values = rowMajor.Slice(offset, j);
                for (var a = 0; a < sums.Count; a++)
                {
                    var s = 0.0;
                    foreach (var k in sums[a])
                    {
                        s += values[k];
                    }

                    block[((j + a) * BlockRows) + r] = Math.Log(s);
                }
            }
        }
        finally
        {
            ArrayPool<double>.Shared.Return(logs);
        }
    }

    // ln over a span, four lanes at a time where the hardware has them (within a few ulps of Math.Log).
    private static void VectorLog(ReadOnlySpan<double> x, Span<double> result)
    {
        var i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var vx = MemoryMarshal.Cast<double, Vector256<double>>(x);
            var vr = MemoryMarshal.Cast<double, Vector256<double>>(result);
            for (; i < vx.Length; i++)
            {
                vr[i] = Vector256.Log(vx[i]);
            }

            i *= Vector256<double>.Count;
        }

        for (; i < x.Length; i++)
        {
            result[i] = Math.Log(x[i]);
        }
    }
}
