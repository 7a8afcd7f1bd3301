using System.ComponentModel.DataAnnotations;
using System.Globalization;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Summary;

/// <summary>A table whose rows are compared pairwise.</summary>
public sealed record DistancesRequest : ITableRequest<DistancesRequest>
{
    /// <summary>Two or more unique, non-empty part names.</summary>
    [Required]
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>At most 5,000 rows (by default), each as long as <c>parts</c>, finite and non-negative.</summary>
    [Required]
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids: unique, one per row.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>The zero policy; default <c>reject</c>.</summary>
    public ZerosOption? Zeros { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static DistancesRequest FromCsv(CsvTable csv, IQueryCollection query) => new()
    {
        Csv = csv,
        Zeros = ZerosOption.FromQuery(query),
    };

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<DistancesRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<DistancesRequest>(context);
}

/// <summary>The Aitchison distances between every two rows.</summary>
/// <param name="Ids">The sample ids, when the request had them; they label the matrix's rows and columns.</param>
/// <param name="Matrix">d_A(x_a, x_b) = ‖clr(x_a) − clr(x_b)‖, n × n, symmetric, zero diagonal (Aitchison et al. 2000).</param>
/// <param name="Imputed">Every cell the zero policy replaced, with its value in the request's units.</param>
public sealed record DistancesResponse(IReadOnlyList<string>? Ids, RowMajor Matrix, IReadOnlyList<ImputedCellItem> Imputed) : ICsvResponse
{
    /// <inheritdoc />
    [JsonIgnore]
    public int? ImputedCount => Imputed.Count;

    /// <inheritdoc />
    /// <remarks>Columns are labelled by the ids, or by 0-based row numbers when there are none.</remarks>
    public CsvTable ToCsv() => new(
        Ids ?? [.. Enumerable.Range(0, Matrix.RowCount).Select(i => i.ToString(CultureInfo.InvariantCulture))],
        Matrix.Values,
        Ids);
}
