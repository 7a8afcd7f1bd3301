using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Coordinates;

/// <summary>A table to close, after its zeros are handled.</summary>
public sealed record PrepareRequest : ITableRequest<PrepareRequest>
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

    /// <summary>The closure total κ &gt; 0: 1 (default) for proportions, 100 for percent, 10⁶ for ppm.</summary>
    public double? Total { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static PrepareRequest FromCsv(CsvTable csv, IQueryCollection query) => new()
    {
        Csv = csv,
        Zeros = ZerosOption.FromQuery(query),
        Total = QueryOptions.Number(query, "total", "/total"),
    };

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<PrepareRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<PrepareRequest>(context);
}

/// <summary>The closed table and the cells the zero policy replaced.</summary>
/// <param name="Parts">The part names.</param>
/// <param name="Rows">The closed rows: each sums to <c>total</c>.</param>
/// <param name="Ids">The sample ids, when the request had them.</param>
/// <param name="Imputed">Every replaced cell, with its value in the closed table's units.</param>
public sealed record PrepareResponse(IReadOnlyList<string> Parts, RowMajor Rows, IReadOnlyList<string>? Ids, IReadOnlyList<ImputedCellItem> Imputed) : ICsvResponse
{
    /// <inheritdoc />
    [JsonIgnore]
    public int? ImputedCount => Imputed.Count;

    /// <inheritdoc />
    public CsvTable ToCsv() => new(Parts, Rows.Values, Ids);
}
