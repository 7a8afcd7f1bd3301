using Partwise.Core.Tables;

namespace Partwise.Core.Transforms;

/// <summary>
/// Additive log-ratios alr_j(x) = ln(x_j / x_D) for every part j ≠ D (Aitchison 1986, §4.6). Not isometric, but
/// each coordinate is a plain log-ratio a chemist reads directly.
/// </summary>
public static class Alr
{
    /// <summary>The alr of every row with denominator part <paramref name="denominator"/>.</summary>
    /// <param name="table">Strictly positive (apply a zero policy first).</param>
    /// <param name="denominator">0-based index of D.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>n × (J − 1) coordinates labelled <c>part/D</c>, in table order without D.</returns>
    public static LogRatioCoordinates Forward(CompositionTable table, int denominator, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var j = table.PartCount;
        ArgumentOutOfRangeException.ThrowIfNegative(denominator);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(denominator, j);
        var width = j - 1;
        var source = table.Values;
        var values = new double[table.RowCount * width];
        for (var i = 0; i < table.RowCount; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            var row = source.AsSpan(i * j, j);
            var logD = Math.Log(row[denominator]);
            var output = values.AsSpan(i * width, width);
            var c = 0;
            for (var k = 0; k < j; k++)
            {
                if (k != denominator)
                {
                    output[c++] = Math.Log(row[k]) - logD;
                }
            }
        }

        var labels = table.Parts.Where((_, k) => k != denominator).Select(p => $"{p}/{table.Parts[denominator]}").ToArray();
        return new LogRatioCoordinates(labels, values, table.RowCount, table.Ids);
    }

    /// <summary>The inverse x = C([exp(y), 1]) with the 1 placed at the denominator's position (Aitchison 1986).</summary>
    /// <param name="parts">Part names of the result, denominator included.</param>
    /// <param name="denominator">0-based index of D in <paramref name="parts"/>.</param>
    /// <param name="values">n × (J − 1) finite coordinates, row-major.</param>
    /// <param name="total">κ &gt; 0 for the closure.</param>
    /// <param name="ids">Optional ids for the result.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    public static CompositionTable Inverse(IReadOnlyList<string> parts, int denominator, double[] values, double total = 1.0, IReadOnlyList<string>? ids = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(parts);
        var j = parts.Count;
        ArgumentOutOfRangeException.ThrowIfNegative(denominator);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(denominator, j);
        Closure.RequireTotal(total, "/total");
        var width = j - 1;
        CoordinateInput.Require(values, width);
        var n = values.Length / width;
        var logs = new double[j];
        var result = new double[n * j];
        for (var i = 0; i < n; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            var y = values.AsSpan(i * width, width);
            var c = 0;
            for (var k = 0; k < j; k++)
            {
                logs[k] = k == denominator ? 0 : y[c++];
            }

            Clr.ExpClose(logs, result.AsSpan(i * j, j), total);
        }

        return CompositionTable.FromValues(parts, result, ids);
    }
}
