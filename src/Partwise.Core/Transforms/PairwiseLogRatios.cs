using Partwise.Core.Tables;

namespace Partwise.Core.Transforms;

/// <summary>
/// All J (J − 1) / 2 pairwise log-ratios ln(x_a / x_b), a &lt; b, in the order (first index, then second), the lower
/// index as numerator (Aitchison 1986; Greenacre 2019, Math. Geosci. 51:649-682, uses the same set as candidates).
/// </summary>
public static class PairwiseLogRatios
{
    /// <summary>The pairwise log-ratios of every row of a strictly positive table, labelled <c>a/b</c>.</summary>
    /// <param name="table">Strictly positive (apply a zero policy first).</param>
    /// <param name="cancellationToken">Looked at every row; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    public static LogRatioCoordinates Forward(CompositionTable table, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var j = table.PartCount;
        var width = j * (j - 1) / 2;
        var labels = new string[width];
        var c = 0;
        for (var a = 0; a < j; a++)
        {
            for (var b = a + 1; b < j; b++)
            {
                labels[c++] = $"{table.Parts[a]}/{table.Parts[b]}";
            }
        }

        var source = table.Values;
        var values = new double[checked(table.RowCount * width)];
        Span<double> logs = j <= 256 ? stackalloc double[j] : new double[j];
        for (var i = 0; i < table.RowCount; i++)
        {
            // A row holds J(J − 1)/2 values, up to half a million: look at every row.
            cancellationToken.ThrowIfCancellationRequested();
            var row = source.AsSpan(i * j, j);
            for (var k = 0; k < j; k++)
            {
                logs[k] = Math.Log(row[k]);
            }

            var output = values.AsSpan(i * width, width);
            c = 0;
            for (var a = 0; a < j; a++)
            {
                for (var b = a + 1; b < j; b++)
                {
                    output[c++] = logs[a] - logs[b];
                }
            }
        }

        return new LogRatioCoordinates(labels, values, table.RowCount, table.Ids);
    }
}
