using System.ComponentModel.DataAnnotations;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;

namespace Partwise.Api.Coordinates;

/// <summary>
/// The log-ratio transform (<c>"transform"</c>): <c>clr</c> (optional <c>weights</c>), <c>alr</c> (optional
/// <c>denominator</c>, default the last part), <c>ilr</c> (pivot basis, or a sequential binary
/// <c>partition</c>), <c>pairwise</c> (all J(J − 1)/2 log-ratios) or <c>ratios</c> (an expert's list).
/// </summary>
public sealed record TransformOption
{
    /// <summary>The type names of the contract.</summary>
    public static readonly string[] Types = ["clr", "alr", "ilr", "pairwise", "ratios"];

    /// <summary><c>clr</c>, <c>alr</c>, <c>ilr</c>, <c>pairwise</c> or <c>ratios</c>.</summary>
    [Required]
    [AllowedValues("clr", "alr", "ilr", "pairwise", "ratios")]
    public string? Type { get; init; }

    /// <summary>For <c>alr</c>: the denominator part; default the last part.</summary>
    public string? Denominator { get; init; }

    /// <summary>
    /// For <c>ilr</c>: a sequential binary partition, J − 1 rows of J signs (+1, −1, 0), each row splitting one group
    /// of an earlier row in two (Egozcue &amp; Pawlowsky-Glahn 2005). Without it the pivot basis is used.
    /// </summary>
    public IReadOnlyList<int[]>? Partition { get; init; }

    /// <summary>For <c>ratios</c>: the log-ratios, one output column each.</summary>
    public IReadOnlyList<RatioOption>? Ratios { get; init; }

    /// <summary>For <c>clr</c>: part weights w, clr_j = ln x_j − Σ w_k ln x_k (Greenacre &amp; Lewi 2009); default equal.</summary>
    public WeightsOption? Weights { get; init; }

    /// <summary>The type, checked against the contract's names.</summary>
    /// <exception cref="CompositionException">400 when the transform or its type is missing or unknown.</exception>
    public static string RequireType(TransformOption? option, string pointer = "/transform")
    {
        if (option is null)
        {
            throw TableRequest.Missing(pointer, $"The request needs \"transform\": an object whose \"type\" is one of {string.Join(", ", Types)}.");
        }

        if (option.Type is null)
        {
            throw TableRequest.Missing(pointer + "/type", $"The transform needs \"type\": one of {string.Join(", ", Types)}.");
        }

        return Array.IndexOf(Types, option.Type) >= 0
            ? option.Type
            : throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/type", $"The transform type '{option.Type}' is unknown; use one of {string.Join(", ", Types)}.");
    }

    /// <summary>
    /// The option from the query of a <c>text/csv</c> request: <c>transform</c> (the type), <c>denominator</c>,
    /// <c>weights</c> / <c>weight.PART</c>. Partitions and ratio lists need a JSON body.
    /// </summary>
    public static TransformOption? FromQuery(IQueryCollection query)
    {
        var type = QueryOptions.Text(query, "transform", "/transform/type");
        var denominator = QueryOptions.Text(query, "denominator", "/transform/denominator");
        var weights = WeightsOption.FromQuery(query, "/transform/weights");
        if (type is null && denominator is null && weights is null)
        {
            return null;
        }

        return type == "ratios"
            ? throw new CompositionException(ProblemTypes.InvalidInput, "/transform/ratios", "A ratio set is a list of objects and needs a JSON body; text/csv takes only simple options.")
            : new TransformOption { Type = type, Denominator = denominator, Weights = weights };
    }
}
