using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Summary;

/// <summary>A table to summarise.</summary>
public sealed record SummaryRequest : ITableRequest<SummaryRequest>
{
    /// <summary>Two or more unique, non-empty part names.</summary>
    [Required]
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>Two or more rows, each as long as <c>parts</c>, finite and non-negative, all in one unit.</summary>
    [Required]
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids: unique, one per row.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>The zero policy; default <c>reject</c>.</summary>
    public ZerosOption? Zeros { get; init; }

    /// <summary>Part weights for the total variance and the clr; default <c>equal</c>.</summary>
    public WeightsOption? Weights { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static SummaryRequest FromCsv(CsvTable csv, IQueryCollection query) => new()
    {
        Csv = csv,
        Zeros = ZerosOption.FromQuery(query),
        Weights = WeightsOption.FromQuery(query),
    };

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<SummaryRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<SummaryRequest>(context);
}

/// <summary>The log-ratio variance summary of a table.</summary>
/// <param name="Parts">The part names; every vector and matrix below follows their order.</param>
/// <param name="Center">The closed geometric mean C(exp(mean ln x)), summing to 1 (Aitchison 1986).</param>
/// <param name="VariationMatrix">T_ab = var(ln(x_a / x_b)), J × J, zero diagonal (Aitchison 1986).</param>
/// <param name="TotalVariance">TV = Σ_{a&lt;b} w_a w_b T_ab = Σ_j w_j var(clr_j) (Greenacre 2019).</param>
/// <param name="PartContributions">w_j var(clr_j) / TV per part, summing to 1 (all zero when TV is 0).</param>
/// <param name="ClrCovariance">The covariance of the weighted clr, J × J.</param>
/// <param name="Weights">The part weights used, summing to 1.</param>
/// <param name="Divisor">The divisor of every variance and covariance here: <c>n-1</c>.</param>
/// <param name="Imputed">Every cell the zero policy replaced, with its value in the request's units.</param>
public sealed record SummaryResponse(
    IReadOnlyList<string> Parts,
    IReadOnlyList<double> Center,
    RowMajor VariationMatrix,
    double TotalVariance,
    IReadOnlyList<double> PartContributions,
    RowMajor ClrCovariance,
    IReadOnlyList<double> Weights,
    string Divisor,
    IReadOnlyList<ImputedCellItem> Imputed);
