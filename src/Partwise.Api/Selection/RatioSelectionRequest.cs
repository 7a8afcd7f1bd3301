using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Selection;

/// <summary>A table (or its moments) in which to choose, step by step, the log-ratios that explain the most variance.</summary>
public sealed record RatioSelectionRequest : ITableRequest<RatioSelectionRequest>
{
    /// <summary>Two or more unique, non-empty part names (with <c>rows</c>; or send <c>moments</c> instead).</summary>
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>Two or more rows, each as long as <c>parts</c>, finite and non-negative, all in one unit.</summary>
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids: unique, one per row.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>In place of a table: the covariance of the logs of the parts and of the named amalgamations' sums.</summary>
    public MomentsOption? Moments { get; init; }

    /// <summary>The zero policy for a table; default <c>reject</c>.</summary>
    public ZerosOption? Zeros { get; init; }

    /// <summary>
    /// Named amalgamations: an object from a name (not a part name) to two or more parts, such as
    /// <c>{"hardness": ["Ca", "Mg"]}</c>. Their order is the order of the candidates.
    /// </summary>
    public Dictionary<string, string[]>? Amalgamations { get; init; }

    /// <summary>Ratios always in, first, in this order; a side may name one amalgamation (<c>{"num": ["hardness"], "den": ["Na"]}</c>).</summary>
    public IReadOnlyList<RatioOption?>? Force { get; init; }

    /// <summary>Parts never used by a candidate, nor are amalgamations that contain them. The variance to explain still covers every part.</summary>
    public IReadOnlyList<string>? Exclude { get; init; }

    /// <summary>When to stop.</summary>
    public StopOption? Stop { get; init; }

    /// <summary>Part weights; default <c>equal</c>. With <c>moments</c> only <c>equal</c> or a weight per part (mean proportions need the table).</summary>
    public WeightsOption? Weights { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static RatioSelectionRequest FromCsv(CsvTable csv, IQueryCollection query)
    {
        var maxRatios = QueryOptions.Number(query, "maxRatios", "/stop/maxRatios");
        var explained = QueryOptions.Number(query, "explained", "/stop/explained");
        return new()
        {
            Csv = csv,
            Zeros = ZerosOption.FromQuery(query),
            Weights = WeightsOption.FromQuery(query),
            Stop = maxRatios is null && explained is null ? null : new StopOption { MaxRatios = StopOption.Whole(maxRatios), Explained = explained },
        };
    }

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<RatioSelectionRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<RatioSelectionRequest>(context);
}

/// <summary>Second moments computed elsewhere (a distributed engine, a database), in place of a table.</summary>
public sealed record MomentsOption
{
    /// <summary>The part names, then the names of the named amalgamations in the order of <c>amalgamations</c>.</summary>
    [Required]
    public IReadOnlyList<string>? Names { get; init; }

    /// <summary>
    /// The sample covariance (divisor n − 1) of ln x_1 … ln x_J and then of ln(Σ_A x) of each named amalgamation, in the
    /// order of <c>names</c>: square, symmetric, positive semi-definite.
    /// </summary>
    [Required]
    public IReadOnlyList<double[]>? Covariance { get; init; }

    /// <summary>The number of samples n behind the covariance, n ≥ 2.</summary>
    [Required]
    public long? Count { get; init; }
}

/// <summary>The stopping rule of a selection.</summary>
public sealed record StopOption
{
    /// <summary>The most ratios, forced ones included; default the number of usable parts minus one.</summary>
    public int? MaxRatios { get; init; }

    /// <summary>Stop at the first step whose cumulative explained fraction reaches this, in (0, 1]; default 1. That step is included.</summary>
    public double? Explained { get; init; }

    /// <summary>A whole number from the query, or a 400 at <c>/stop/maxRatios</c>.</summary>
    public static int? Whole(double? value) =>
        value is null ? null
        : value == Math.Floor(value.Value) && Math.Abs(value.Value) <= int.MaxValue ? (int)value.Value
        : throw new Partwise.Core.Problems.CompositionException(Partwise.Core.Problems.ProblemTypes.InvalidInput, "/stop/maxRatios", "The query parameter 'maxRatios' must be a whole number.");
}
