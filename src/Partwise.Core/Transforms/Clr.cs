using Partwise.Core.Tables;

namespace Partwise.Core.Transforms;

/// <summary>
/// Centred log-ratios clr_j(x) = ln x_j − Σ_k w_k ln x_k (Aitchison 1986; with part weights w: Greenacre &amp; Lewi
/// 2009, J. Classification 26:29-54). With equal weights w_k = 1/J each row sums to zero.
/// </summary>
public static class Clr
{
    /// <summary>
    /// The clr of every row of a strictly positive table (apply a zero policy first).
    /// </summary>
    /// <param name="table">Strictly positive; a zero gives −∞, so callers replace zeros before.</param>
    /// <param name="weights">Part weights summing to 1 (length J), or null for 1/J.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>n × J coordinates labelled <c>clr(part)</c>.</returns>
    public static LogRatioCoordinates Forward(CompositionTable table, double[]? weights = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var j = table.PartCount;
        if (weights is not null && weights.Length != j)
        {
            throw new ArgumentException("One weight per part is needed.", nameof(weights));
        }

        var source = table.Values;
        var values = new double[source.Length];
        for (var i = 0; i < table.RowCount; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            RowForward(source.AsSpan(i * j, j), values.AsSpan(i * j, j), weights);
        }

        return new LogRatioCoordinates(table.Parts.Select(p => $"clr({p})").ToArray(), values, table.RowCount, table.Ids);
    }

    /// <summary>The clr of one positive row into <paramref name="output"/> (same length).</summary>
    public static void RowForward(ReadOnlySpan<double> row, Span<double> output, double[]? weights = null)
    {
        var centre = 0.0;
        for (var k = 0; k < row.Length; k++)
        {
            var l = Math.Log(row[k]);
            output[k] = l;
            centre += weights is null ? l : weights[k] * l;
        }

        if (weights is null)
        {
            centre /= row.Length;
        }

        for (var k = 0; k < row.Length; k++)
        {
            output[k] -= centre;
        }
    }

    /// <summary>
    /// The inverse x = C(exp(y)): any real vector y maps to the composition whose clr (equal weights) is y minus its
    /// mean. The largest y is subtracted before exp so that large coordinates do not overflow.
    /// </summary>
    /// <param name="parts">Part names of the result (J ≥ 2).</param>
    /// <param name="values">n × J coordinates, row-major, finite (see <see cref="CoordinateInput.Require"/>).</param>
    /// <param name="total">κ &gt; 0 for the closure.</param>
    /// <param name="ids">Optional ids for the result.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    public static CompositionTable Inverse(IReadOnlyList<string> parts, double[] values, double total = 1.0, IReadOnlyList<string>? ids = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(parts);
        Closure.RequireTotal(total, "/total");
        CoordinateInput.Require(values, parts.Count);
        var result = new double[values.Length];
        var j = parts.Count;
        for (var i = 0; i < values.Length / j; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            ExpClose(values.AsSpan(i * j, j), result.AsSpan(i * j, j), total);
        }

        return CompositionTable.FromValues(parts, result, ids);
    }

    /// <summary>output = κ · exp(y − max y) / Σ exp(y − max y), the closure of exp(y) without overflow.</summary>
    internal static void ExpClose(ReadOnlySpan<double> y, Span<double> output, double total)
    {
        var max = double.NegativeInfinity;
        foreach (var v in y)
        {
            max = Math.Max(max, v);
        }

        var sum = 0.0;
        for (var k = 0; k < y.Length; k++)
        {
            output[k] = Math.Exp(y[k] - max);
            sum += output[k];
        }

        var scale = total / sum;
        for (var k = 0; k < y.Length; k++)
        {
            output[k] *= scale;
        }
    }
}
