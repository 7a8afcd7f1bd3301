namespace Partwise.Api.Infrastructure;

/// <summary>
/// A numeric table as it travels in <c>text/csv</c>: a header of column names, values row-major, and optional row
/// ids (the first column when it is named <c>id</c>).
/// </summary>
/// <param name="Columns">The column names, without the id column.</param>
/// <param name="Values">n × k values, row-major.</param>
/// <param name="Ids">One id per row, or null when the table has no id column.</param>
public sealed record CsvTable(IReadOnlyList<string> Columns, double[] Values, IReadOnlyList<string>? Ids)
{
    /// <summary>The name of the optional first column that holds row ids.</summary>
    public const string IdColumn = "id";

    /// <summary>The media type of CSV bodies.</summary>
    public const string MediaType = "text/csv";

    /// <summary>n.</summary>
    public int RowCount => Columns.Count == 0 ? 0 : Values.Length / Columns.Count;
}
