using Partwise.Core.Ratios;
using Partwise.Core.Tables;

namespace Partwise.Core.Transforms;

/// <summary>
/// The values of an expert's ratio set (pairwise, amalgamation and balance log-ratios; see <see cref="LogRatio"/>)
/// for every row of a table.
/// </summary>
public static class RatioSetTransform
{
    /// <summary>One column per ratio, labelled with the ratio's label.</summary>
    /// <param name="table">Strictly positive on every part the ratios use (apply a zero policy first).</param>
    /// <param name="ratios">At least one ratio over the table's parts.</param>
    /// <param name="cancellationToken">Looked at every 1,024 rows; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    public static LogRatioCoordinates Forward(CompositionTable table, IReadOnlyList<LogRatio> ratios, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(ratios);
        var width = ratios.Count;
        var values = new double[table.RowCount * width];
        for (var i = 0; i < table.RowCount; i++)
        {
            Cancellation.AtRow(i, cancellationToken);
            var row = table.Row(i);
            for (var c = 0; c < width; c++)
            {
                values[(i * width) + c] = ratios[c].Evaluate(row);
            }
        }

        return new LogRatioCoordinates(ratios.Select(r => r.Label).ToArray(), values, table.RowCount, table.Ids);
    }
}
