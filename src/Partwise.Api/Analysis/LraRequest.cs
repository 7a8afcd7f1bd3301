using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Analysis;

/// <summary>A table for log-ratio analysis.</summary>
public sealed record LraRequest : ITableRequest<LraRequest>
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

    /// <summary>Part weights: <c>equal</c> (default) or <c>mean</c> (mean closed proportions, Greenacre &amp; Lewi 2009); a weight per part also works.</summary>
    public WeightsOption? Weights { get; init; }

    /// <summary>How many dimensions of coordinates to return: 1 ≤ d ≤ min(J − 1, n − 1); default 2 (1 when only one exists).</summary>
    public int? Dimensions { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static LraRequest FromCsv(CsvTable csv, IQueryCollection query)
    {
        var dimensions = QueryOptions.Number(query, "dimensions", "/dimensions");
        return new()
        {
            Csv = csv,
            Zeros = ZerosOption.FromQuery(query),
            Weights = WeightsOption.FromQuery(query),
            Dimensions = dimensions is null ? null
                : dimensions == Math.Floor(dimensions.Value) && Math.Abs(dimensions.Value) <= int.MaxValue ? (int)dimensions.Value
                : throw new Partwise.Core.Problems.CompositionException(Partwise.Core.Problems.ProblemTypes.InvalidInput, "/dimensions", "The query parameter 'dimensions' must be a whole number."),
        };
    }

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<LraRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<LraRequest>(context);
}

/// <summary>The log-ratio analysis of a table: the weighted PCA of its centred log-ratios.</summary>
/// <param name="SingularValues">All min(J − 1, n − 1) singular values s_k, descending.</param>
/// <param name="Inertia">s_k² / TV per dimension: the fraction of the total log-ratio variance each shows.</param>
/// <param name="TotalVariance">TV = Σ_j w_j var(clr_j) = Σ s_k², divisor <c>divisor</c>.</param>
/// <param name="Divisor">The divisor of the total variance: <c>n</c>.</param>
/// <param name="Rows">The samples' principal coordinates.</param>
/// <param name="Parts">The parts' standard coordinates and contributions.</param>
/// <param name="Weights">The part weights used, in the order of <c>parts.names</c>, summing to 1.</param>
/// <param name="Imputed">Every cell the zero policy replaced, with its value in the request's units.</param>
public sealed record LraResponse(
    IReadOnlyList<double> SingularValues,
    IReadOnlyList<double> Inertia,
    double TotalVariance,
    string Divisor,
    LraRows Rows,
    LraParts Parts,
    IReadOnlyList<double> Weights,
    IReadOnlyList<ImputedCellItem> Imputed) : IPictureResponse
{
    /// <inheritdoc />
    public string ToSvg() => LraBiplot.Render(this);
}

/// <summary>The samples of an LRA.</summary>
/// <param name="Ids">The sample ids, when the request had them.</param>
/// <param name="Principal">Row principal coordinates D_r^(−1/2) U S: one row of d values per sample.</param>
public sealed record LraRows(IReadOnlyList<string>? Ids, double[][] Principal);

/// <summary>The parts of an LRA.</summary>
/// <param name="Names">The part names.</param>
/// <param name="Standard">Part standard coordinates D_w^(−1/2) V: one row of d values per part.</param>
/// <param name="Contributions">Part contributions V²: one row of d values per part; each dimension's column sums to 1.</param>
public sealed record LraParts(IReadOnlyList<string> Names, double[][] Standard, double[][] Contributions);
