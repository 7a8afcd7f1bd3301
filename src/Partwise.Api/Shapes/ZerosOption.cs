using System.ComponentModel.DataAnnotations;
using System.Text.Json;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Core.Problems;
using Partwise.Core.Zeros;

namespace Partwise.Api.Shapes;

/// <summary>
/// The zero policy (<c>"zeros"</c>): what to do with zero cells before logs are taken. Absent means
/// <c>reject</c>.
/// </summary>
public sealed record ZerosOption
{
    /// <summary>The method names of the contract.</summary>
    public static readonly string[] Methods = ["reject", "multiplicative", "bayesian-multiplicative"];

    /// <summary>The prior names of the contract, for <c>bayesian-multiplicative</c>.</summary>
    public static readonly string[] Priors = ["bayes-laplace", "jeffreys", "perks", "square-root"];

    /// <summary>
    /// <c>reject</c> (a zero is a 422 pointing at its cell), <c>multiplicative</c> (zeros below detection limits,
    /// Martín-Fernández et al. 2003) or <c>bayesian-multiplicative</c> (count zeros, Martín-Fernández et al. 2015).
    /// </summary>
    [Required]
    [AllowedValues("reject", "multiplicative", "bayesian-multiplicative")]
    public string? Method { get; init; }

    /// <summary>For <c>multiplicative</c>: one limit for every part (a number) or a limit per part (an object), in the table's units.</summary>
    public DetectionLimits? DetectionLimits { get; init; }

    /// <summary>For <c>multiplicative</c>: a zero becomes fraction × limit; in (0, 1], default 0.65 (common practice).</summary>
    [Range(0.0, 1.0, MinimumIsExclusive = true)]
    public double? Fraction { get; init; }

    /// <summary>For <c>bayesian-multiplicative</c> (integer rows only): <c>bayes-laplace</c>, <c>jeffreys</c>, <c>perks</c> or <c>square-root</c>.</summary>
    [AllowedValues("bayes-laplace", "jeffreys", "perks", "square-root")]
    public string? Prior { get; init; }

    /// <summary>The Core policy for an optional option: absent is <see cref="ZeroPolicy.Reject"/>.</summary>
    /// <exception cref="CompositionException">400 for a missing or unknown method or prior.</exception>
    public static ZeroPolicy ToPolicy(ZerosOption? option, string pointer = "/zeros")
    {
        if (option is null)
        {
            return ZeroPolicy.Reject;
        }

        switch (option.Method)
        {
            case null:
                throw TableRequest.Missing(pointer + "/method", $"A zero policy needs \"method\": one of {string.Join(", ", Methods)}.");
            case "reject":
                return ZeroPolicy.Reject;
            case "multiplicative":
                return new MultiplicativeReplacement(
                    option.DetectionLimits?.All,
                    option.DetectionLimits?.ByPart,
                    option.Fraction ?? MultiplicativeReplacement.DefaultFraction);
            case "bayesian-multiplicative":
                var prior = option.Prior switch
                {
                    null => throw TableRequest.Missing(pointer + "/prior", $"The bayesian-multiplicative policy needs \"prior\": one of {string.Join(", ", Priors)}."),
                    "bayes-laplace" => CountPrior.BayesLaplace,
                    "jeffreys" => CountPrior.Jeffreys,
                    "perks" => CountPrior.Perks,
                    "square-root" => CountPrior.SquareRoot,
                    _ => throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/prior", $"The prior '{option.Prior}' is unknown; use one of {string.Join(", ", Priors)}."),
                };
                return new BayesianMultiplicativeReplacement(prior);
            default:
                throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/method", $"The zero method '{option.Method}' is unknown; use one of {string.Join(", ", Methods)}.");
        }
    }

    /// <summary>
    /// The option from the query of a <c>text/csv</c> request: <c>zeros</c> (the method), <c>detectionLimit</c>
    /// (one for all) or <c>detectionLimit.PART</c> (per part), <c>fraction</c>, <c>prior</c>.
    /// </summary>
    public static ZerosOption? FromQuery(IQueryCollection query)
    {
        var method = QueryOptions.Text(query, "zeros", "/zeros/method");
        var all = QueryOptions.Number(query, "detectionLimit", "/zeros/detectionLimits");
        var byPart = QueryOptions.NumberMap(query, "detectionLimit", "/zeros/detectionLimits");
        var fraction = QueryOptions.Number(query, "fraction", "/zeros/fraction");
        var prior = QueryOptions.Text(query, "prior", "/zeros/prior");
        if (method is null && all is null && byPart is null && fraction is null && prior is null)
        {
            return null;
        }

        return new ZerosOption
        {
            Method = method,
            DetectionLimits = all is null && byPart is null ? null : new DetectionLimits(all, byPart),
            Fraction = fraction,
            Prior = prior,
        };
    }
}

/// <summary>Detection limits: one number for every part, and/or a limit per part name (which wins).</summary>
/// <param name="All">One limit for every part, or null.</param>
/// <param name="ByPart">Limits per part name, or null.</param>
[JsonConverter(typeof(DetectionLimitsConverter))]
public sealed record DetectionLimits(double? All, IReadOnlyDictionary<string, double>? ByPart);

/// <summary>Reads <c>detectionLimits</c> as a JSON number or an object from part name to number.</summary>
public sealed class DetectionLimitsConverter : JsonConverter<DetectionLimits>
{
    /// <inheritdoc />
    public override DetectionLimits Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options) =>
        reader.TokenType switch
        {
            JsonTokenType.Number => new DetectionLimits(NumberMaps.ReadFinite(ref reader), null),
            JsonTokenType.StartObject => new DetectionLimits(null, NumberMaps.Read(ref reader)),
            _ => throw new JsonException("\"detectionLimits\" is a number (one limit for all parts) or an object from part name to number."),
        };

    /// <inheritdoc />
    public override void Write(Utf8JsonWriter writer, DetectionLimits value, JsonSerializerOptions options)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(value);
        if (value.ByPart is null)
        {
            writer.WriteNumberValue(value.All ?? 0);
            return;
        }

        NumberMaps.Write(writer, value.ByPart);
    }
}
