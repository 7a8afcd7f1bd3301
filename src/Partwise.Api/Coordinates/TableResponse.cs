using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Core.Tables;

namespace Partwise.Api.Coordinates;

/// <summary>A closed table of compositions.</summary>
/// <param name="Parts">The part names.</param>
/// <param name="Rows">The closed rows: each sums to <c>total</c>.</param>
/// <param name="Ids">The sample ids, when the request had them.</param>
public sealed record TableResponse(IReadOnlyList<string> Parts, RowMajor Rows, IReadOnlyList<string>? Ids) : ICsvResponse
{
    /// <inheritdoc />
    [JsonIgnore]
    public int? ImputedCount => null;

    /// <summary>The response for a table.</summary>
    public static TableResponse From(CompositionTable table)
    {
        ArgumentNullException.ThrowIfNull(table);
        return new(table.Parts, new RowMajor(table.Values, table.PartCount), table.Ids);
    }

    /// <inheritdoc />
    public CsvTable ToCsv() => new(Parts, Rows.Values, Ids);
}
