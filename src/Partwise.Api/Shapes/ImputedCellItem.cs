using Partwise.Core.Zeros;

namespace Partwise.Api.Shapes;

/// <summary>One cell that a zero policy replaced.</summary>
/// <param name="Row">0-based row index.</param>
/// <param name="Part">The part's name.</param>
/// <param name="Value">The value the cell now has (see each endpoint for its units).</param>
public sealed record ImputedCellItem(int Row, string Part, double Value)
{
    /// <summary>The cells in the units of the replaced table.</summary>
    public static ImputedCellItem[] From(IReadOnlyList<ImputedCell> cells)
    {
        ArgumentNullException.ThrowIfNull(cells);
        return [.. cells.Select(c => new ImputedCellItem(c.Row, c.Part, c.Value))];
    }
}
