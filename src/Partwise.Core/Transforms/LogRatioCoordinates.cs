namespace Partwise.Core.Transforms;

/// <summary>
/// A table of log-ratio coordinates: n rows of k columns, row-major, with a label per column and the ids of the
/// table it came from.
/// </summary>
public sealed class LogRatioCoordinates
{
    /// <summary>Wraps row-major values (taken over, not copied).</summary>
    /// <param name="columns">One label per column.</param>
    /// <param name="values">n × k values, row-major.</param>
    /// <param name="rowCount">n.</param>
    /// <param name="ids">The source table's ids, or null.</param>
    public LogRatioCoordinates(IReadOnlyList<string> columns, double[] values, int rowCount, IReadOnlyList<string>? ids)
    {
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(values);
        if (values.Length != columns.Count * rowCount)
        {
            throw new ArgumentException("The values must hold rowCount × columns.Count numbers.", nameof(values));
        }

        Columns = columns;
        Values = values;
        RowCount = rowCount;
        Ids = ids;
    }

    /// <summary>Column labels, e.g. <c>clr(Na)</c>, <c>Na/Cl</c>, <c>g(Ca)/g(Mg,Na)</c>.</summary>
    public IReadOnlyList<string> Columns { get; }

    /// <summary>Values, row-major: column c of row i is at <c>i * ColumnCount + c</c>.</summary>
    public double[] Values { get; }

    /// <summary>n.</summary>
    public int RowCount { get; }

    /// <summary>k.</summary>
    public int ColumnCount => Columns.Count;

    /// <summary>The source table's ids, or null.</summary>
    public IReadOnlyList<string>? Ids { get; }

    /// <summary>The coordinates of row <paramref name="i"/>.</summary>
    public ReadOnlySpan<double> Row(int i) => Values.AsSpan(i * ColumnCount, ColumnCount);
}
