using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Coordinates;

/// <summary>A table to transform into log-ratio coordinates.</summary>
public sealed record CoordinatesRequest : ITableRequest<CoordinatesRequest>
{
    /// <summary>Two or more unique, non-empty part names.</summary>
    [Required]
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>One array per sample, each as long as <c>parts</c>, finite and non-negative, all in one unit.</summary>
    [Required]
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids: unique, one per row.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>The zero policy; default <c>reject</c>.</summary>
    public ZerosOption? Zeros { get; init; }

    /// <summary>The transform (required).</summary>
    [Required]
    public TransformOption? Transform { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static CoordinatesRequest FromCsv(CsvTable csv, IQueryCollection query) => new()
    {
        Csv = csv,
        Zeros = ZerosOption.FromQuery(query),
        Transform = TransformOption.FromQuery(query),
    };

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<CoordinatesRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<CoordinatesRequest>(context);
}

/// <summary>Log-ratio coordinates, one row per sample.</summary>
/// <param name="Columns">One label per coordinate: <c>clr(Na)</c>, <c>Na/Cl</c>, <c>g(Ca)/g(Mg,Na)</c>, <c>(Ca+Mg)/(Na+K)</c>.</param>
/// <param name="Ids">The sample ids, when the request had them.</param>
/// <param name="Rows">The coordinates (natural logs).</param>
/// <param name="Basis">For <c>ilr</c>: the orthonormal basis V, J rows (parts) × J − 1 columns (coordinates), with z = V' ln x.</param>
/// <param name="Imputed">Every cell the zero policy replaced, with its value in the request's units.</param>
public sealed record CoordinatesResponse(IReadOnlyList<string> Columns, IReadOnlyList<string>? Ids, RowMajor Rows, RowMajor? Basis, IReadOnlyList<ImputedCellItem> Imputed) : ICsvResponse
{
    /// <inheritdoc />
    [JsonIgnore]
    public int? ImputedCount => Imputed.Count;

    /// <inheritdoc />
    public CsvTable ToCsv() => new(Columns, Rows.Values, Ids);
}
