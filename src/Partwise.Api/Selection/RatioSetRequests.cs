using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Selection;

/// <summary>A table and an analyst's ratio set, to see how much of the table's variance the set explains.</summary>
public sealed record RatioSetEvaluationRequest : ITableRequest<RatioSetEvaluationRequest>
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

    /// <summary>The ratio set: one or more pairwise, amalgamation or balance ratios.</summary>
    [Required]
    public IReadOnlyList<RatioOption?>? Ratios { get; init; }

    /// <summary>Part weights; default <c>equal</c>.</summary>
    public WeightsOption? Weights { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static RatioSetEvaluationRequest FromCsv(CsvTable csv, IQueryCollection query) => new()
    {
        Csv = csv,
        Zeros = ZerosOption.FromQuery(query),
        Weights = WeightsOption.FromQuery(query),
        Ratios = RatioOption.FromQuery(query),
    };

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<RatioSetEvaluationRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<RatioSetEvaluationRequest>(context);
}

/// <summary>How much of the variance a ratio set explains.</summary>
/// <param name="Explained">The fraction of the total variance the whole set explains, in [0, 1] (Greenacre 2019).</param>
/// <param name="Procrustes">The Procrustes correlation between the samples in all log-ratios and in the set, in [0, 1] (Gower 1975).</param>
/// <param name="Rank">The dimension the ratio columns span on these data (at most the number of ratios and J − 1).</param>
/// <param name="Invertible">Whether the set determines the composition (then <c>/v1/ratio-sets/reconstruct</c> inverts it).</param>
/// <param name="TotalVariance">TV = Σ_j w_j var(clr_j), divisor <c>divisor</c>.</param>
/// <param name="Divisor">The divisor of the total variance: <c>n</c>.</param>
/// <param name="PerRatio">One entry per ratio, in the order given.</param>
/// <param name="Imputed">Every cell the zero policy replaced, with its value in the request's units.</param>
public sealed record RatioSetEvaluationResponse(
    double Explained,
    double Procrustes,
    int Rank,
    bool Invertible,
    double TotalVariance,
    string Divisor,
    IReadOnlyList<RatioContributionItem> PerRatio,
    IReadOnlyList<ImputedCellItem> Imputed);

/// <summary>What one ratio of a set explains.</summary>
/// <param name="Label">The ratio's label.</param>
/// <param name="ExplainedAlone">The fraction of the total variance it explains by itself.</param>
/// <param name="UniqueContribution">The set's explained fraction less that of the set without this ratio (0 when the others can stand in for it).</param>
public sealed record RatioContributionItem(string Label, double ExplainedAlone, double UniqueContribution);

/// <summary>Values of a complete ratio set, to turn back into compositions.</summary>
public sealed record RatioReconstructionRequest : ITableRequest<RatioReconstructionRequest>
{
    /// <summary>The J part names of the compositions.</summary>
    [Required]
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>Exactly J − 1 pairwise and amalgamation ratios, or pairwise and balance ratios, that determine a composition.</summary>
    [Required]
    public IReadOnlyList<RatioOption?>? Ratios { get; init; }

    /// <summary>One array of J − 1 ratio values (natural logs) per composition, in the order of <c>ratios</c>.</summary>
    [Required]
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids, carried to the result.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>The closure total κ &gt; 0; default 1.</summary>
    public double? Total { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static RatioReconstructionRequest FromCsv(CsvTable csv, IQueryCollection query)
    {
        ArgumentNullException.ThrowIfNull(query);
        return new()
        {
            Csv = csv,
            Parts = QueryOptions.List(query, "parts"),
            Ratios = RatioOption.FromQuery(query),
            Total = QueryOptions.Number(query, "total", "/total"),
        };
    }

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<RatioReconstructionRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<RatioReconstructionRequest>(context);
}
