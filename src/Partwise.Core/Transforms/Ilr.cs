using Partwise.Core.Tables;

namespace Partwise.Core.Transforms;

/// <summary>
/// Isometric log-ratios z = V' ln x for an orthonormal basis V with V'1 = 0 (Egozcue et al. 2003, Math. Geol.
/// 35:279-300). The Aitchison distance between two compositions equals the Euclidean distance of their ilr.
/// </summary>
public static class Ilr
{
    /// <summary>The ilr of every row of a strictly positive table.</summary>
    /// <param name="table">Strictly positive (apply a zero policy first); parts in the basis's order.</param>
    /// <param name="basis">A basis for the table's J parts.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>n × (J − 1) coordinates labelled by the basis's balances.</returns>
    public static LogRatioCoordinates Forward(CompositionTable table, IlrBasis basis, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(basis);
        var j = table.PartCount;
        if (basis.PartCount != j)
        {
            throw new ArgumentException("The basis must have one row per part of the table.", nameof(basis));
        }

        var d = j - 1;
        var v = basis.Coefficients;
        var source = table.Values;
        var values = new double[table.RowCount * d];
        Span<double> logs = j <= 256 ? stackalloc double[j] : new double[j];
        for (var i = 0; i < table.RowCount; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            var row = source.AsSpan(i * j, j);
            for (var k = 0; k < j; k++)
            {
                logs[k] = Math.Log(row[k]);
            }

            // z = Σ_k ln x_k · V[k, ·]: one pass down the rows of V keeps the access contiguous.
            var z = values.AsSpan(i * d, d);
            for (var k = 0; k < j; k++)
            {
                var l = logs[k];
                var vk = v.AsSpan(k * d, d);
                for (var c = 0; c < d; c++)
                {
                    z[c] += l * vk[c];
                }
            }
        }

        return new LogRatioCoordinates(basis.Labels, values, table.RowCount, table.Ids);
    }

    /// <summary>The inverse x = C(exp(V z)) (Egozcue et al. 2003).</summary>
    /// <param name="basis">The basis the coordinates were made with.</param>
    /// <param name="values">n × (J − 1) finite coordinates, row-major.</param>
    /// <param name="total">κ &gt; 0 for the closure.</param>
    /// <param name="ids">Optional ids for the result.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    public static CompositionTable Inverse(IlrBasis basis, double[] values, double total = 1.0, IReadOnlyList<string>? ids = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(basis);
        Closure.RequireTotal(total, "/total");
        var j = basis.PartCount;
        var d = basis.Dimension;
        CoordinateInput.Require(values, d);
        var n = values.Length / d;
        var v = basis.Coefficients;
        var clr = new double[j];
        var result = new double[n * j];
        for (var i = 0; i < n; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            var z = values.AsSpan(i * d, d);
            for (var k = 0; k < j; k++)
            {
                var vk = v.AsSpan(k * d, d);
                var s = 0.0;
                for (var c = 0; c < d; c++)
                {
                    s += vk[c] * z[c];
                }

                clr[k] = s;
            }

            Clr.ExpClose(clr, result.AsSpan(i * j, j), total);
        }

        return CompositionTable.FromValues(basis.Parts, result, ids);
    }
}
