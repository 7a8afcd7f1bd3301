using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;

namespace Partwise.Api.Baselines;

/// <summary>Reference samples and the options to fit a screening baseline to them.</summary>
public sealed record BaselineRequest : ITableRequest<BaselineRequest>
{
    /// <summary>The baseline's name (1 to 200 characters). A refit under the same name gets the next version.</summary>
    [Required]
    public string? Name { get; init; }

    /// <summary>Free text kept with the baseline (at most 2,000 characters).</summary>
    public string? Description { get; init; }

    /// <summary>Two or more unique, non-empty part names.</summary>
    [Required]
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>The reference samples: one array per sample, each as long as <c>parts</c>, finite and non-negative, all in one unit.</summary>
    [Required]
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids: unique, one per row.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>The zero policy; default <c>reject</c>. It is stored with the baseline and applied to every screened sample.</summary>
    public ZerosOption? Zeros { get; init; }

    /// <summary>The coordinates the distance is measured in; default <c>{"type": "ilr"}</c>.</summary>
    public BaselineCoordinatesOption? Coordinates { get; init; }

    /// <summary><c>robust</c> (default: reweighted MCD by FAST-MCD) or <c>classical</c> (mean and covariance, n − 1).</summary>
    [AllowedValues("robust", "classical")]
    public string? Scatter { get; init; }

    /// <summary>The quantile of χ²_p that becomes the d² threshold, in (0, 1); default 0.975.</summary>
    public double? Cutoff { get; init; }

    /// <summary>Limits on ratio values (not their logs); a violated rule flags a sample whatever its distance.</summary>
    public IReadOnlyList<RuleOption>? Rules { get; init; }

    /// <summary>
    /// Named amalgamations (name to two or more parts). Every ratio between two of them with no part in common
    /// (labelled <c>hardness/alkalis</c>) keeps its own robust location and scale and serves as a reason.
    /// </summary>
    public IReadOnlyDictionary<string, IReadOnlyList<string>>? Amalgamations { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static BaselineRequest FromCsv(CsvTable csv, IQueryCollection query)
    {
        var type = QueryOptions.Text(query, "coordinates", "/coordinates/type");
        if (type is "ratios" or "selection")
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/coordinates", $"{type} coordinates are lists or objects and need a JSON body; text/csv takes only simple options.");
        }

        return new()
        {
            Csv = csv,
            Name = QueryOptions.Text(query, "name", "/name"),
            Description = QueryOptions.Text(query, "description", "/description"),
            Zeros = ZerosOption.FromQuery(query),
            Coordinates = type is null ? null : new BaselineCoordinatesOption { Type = type },
            Scatter = QueryOptions.Text(query, "scatter", "/scatter"),
            Cutoff = QueryOptions.Number(query, "cutoff", "/cutoff"),
        };
    }

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<BaselineRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<BaselineRequest>(context);
}

/// <summary>
/// The coordinates of a baseline: <c>ilr</c> (pivot basis, J − 1 coordinates; the default), <c>ratios</c> (an
/// expert's pairwise and balance log-ratios) or <c>selection</c> (pairwise ratios chosen by stepwise selection).
/// </summary>
public sealed record BaselineCoordinatesOption
{
    /// <summary><c>ilr</c>, <c>ratios</c> or <c>selection</c>.</summary>
    [Required]
    [AllowedValues("ilr", "ratios", "selection")]
    public string? Type { get; init; }

    /// <summary>For <c>ratios</c>: pairwise and balance log-ratios, linearly independent. Amalgamations are not linear in the logs and cannot be coordinates (use them in rules or named amalgamations).</summary>
    public IReadOnlyList<RatioOption>? Ratios { get; init; }

    /// <summary>For <c>selection</c>: the most ratios to choose, 1 to J − 1; default J − 1.</summary>
    public int? MaxRatios { get; init; }

    /// <summary>For <c>selection</c>: stop once this fraction of the log-ratio variance is explained, in (0, 1].</summary>
    public double? Explained { get; init; }

    /// <summary>
    /// Not taken for <c>selection</c> (a 422): selection baselines choose pairwise ratios only, since amalgamation
    /// ratios are not linear in the logs. Give named amalgamations as the request's <c>amalgamations</c> instead.
    /// </summary>
    public IReadOnlyDictionary<string, IReadOnlyList<string>>? Amalgamations { get; init; }
}

/// <summary>A limit on one ratio's value: <c>{"ratio": {"num": ["Cl"], "den": ["HCO3"]}, "max": 0.5}</c>.</summary>
public sealed record RuleOption
{
    /// <summary>The ratio (pairwise, amalgamation or balance); its value is x_A / x_B, Σ_A x / Σ_B x, or e^balance.</summary>
    [Required]
    public RatioOption? Ratio { get; init; }

    /// <summary>The lowest acceptable value, or absent.</summary>
    public double? Min { get; init; }

    /// <summary>The highest acceptable value, or absent. At least one of min and max; min ≤ max.</summary>
    public double? Max { get; init; }

    /// <summary>In a baseline document: the ratio's label (ignored on input).</summary>
    public string? Label { get; init; }
}
