using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;

namespace Partwise.Api.Baselines;

/// <summary>Samples to screen against a stored baseline: <c>sample</c> (one) or <c>samples</c> (a batch), not both.</summary>
public sealed record ScreeningRequest
{
    /// <summary>One sample.</summary>
    public SampleItem? Sample { get; init; }

    /// <summary>A batch of samples (at most <c>Partwise:Limits:MaxScreeningSamples</c>, default 1,000), screened and committed together.</summary>
    public IReadOnlyList<SampleItem>? Samples { get; init; }

    /// <summary>Binds the request from a JSON body.</summary>
    public static ValueTask<ScreeningRequest?> BindAsync(HttpContext context) => JsonBody.BindAsync<ScreeningRequest>(context);
}

/// <summary>Samples to screen against a baseline document sent with them; nothing is stored.</summary>
public sealed record InlineScreeningRequest
{
    /// <summary>A baseline document exactly as <c>GET /v1/baselines/{id}</c> returns it.</summary>
    [Required]
    public BaselineDocument? Baseline { get; init; }

    /// <summary>One sample (instead of <c>samples</c>).</summary>
    public SampleItem? Sample { get; init; }

    /// <summary>The samples (at most <c>Partwise:Limits:MaxScreeningSamples</c>, default 1,000).</summary>
    public IReadOnlyList<SampleItem>? Samples { get; init; }

    /// <summary>Binds the request from a JSON body.</summary>
    public static ValueTask<InlineScreeningRequest?> BindAsync(HttpContext context) => JsonBody.BindAsync<InlineScreeningRequest>(context);
}

/// <summary>One sample: its id, its values by part name, and optionally when and where it was taken.</summary>
public sealed record SampleItem
{
    /// <summary>The caller's id of the sample (1 to 200 characters), unique per baseline: the idempotency key of a stored screening.</summary>
    [Required]
    public string? Id { get; init; }

    /// <summary>One finite, non-negative value for each of the baseline's parts and no other, in the reference samples' unit. Zeros get the baseline's zero policy.</summary>
    [Required]
    public IReadOnlyDictionary<string, double>? Values { get; init; }

    /// <summary>When the sample was taken (RFC 3339 date-time with offset), or absent.</summary>
    public DateTimeOffset? ObservedAt { get; init; }

    /// <summary>Where it came from (a well, an instrument, a laboratory; at most 200 characters), or absent.</summary>
    public string? Source { get; init; }
}

/// <summary>The screening of each sample, in the order sent.</summary>
/// <param name="Results">One per sample.</param>
public sealed record ScreeningResponse(IReadOnlyList<ScreeningResultItem> Results);

/// <summary>
/// The screening of one sample. A flag is a statistical signal for review by a qualified analyst, not a decision.
/// </summary>
public sealed record ScreeningResultItem
{
    /// <summary>The sample's id.</summary>
    public required string SampleId { get; init; }

    /// <summary>The Mahalanobis distance d = √((y − μ)ᵀ Σ⁻¹ (y − μ)) of the sample's coordinates from the baseline's location.</summary>
    public required double Distance { get; init; }

    /// <summary>d², compared with the baseline's threshold χ²_p(cutoff).</summary>
    public required double SquaredDistance { get; init; }

    /// <summary>1 − F_χ²(d²; p): the chance that a sample like the reference ones lies at least this far out.</summary>
    public required double PValue { get; init; }

    /// <summary>d² above the threshold, or a rule violated.</summary>
    public required bool Flagged { get; init; }

    /// <summary>The pairwise or named amalgamation ratios with the largest |z|, largest first, whether or not the sample is flagged.</summary>
    public required IReadOnlyList<ReasonItem> Reasons { get; init; }

    /// <summary>Every rule the sample violates, in the baseline's rule order.</summary>
    public required IReadOnlyList<RuleViolationItem> RuleViolations { get; init; }

    /// <summary>Every value the baseline's zero policy replaced, with the value used (in the sample's units).</summary>
    public required IReadOnlyList<ImputedValueItem> Imputed { get; init; }

    /// <summary>The id of the flag this screening raised (see <c>GET /v1/flags</c>); null when not flagged or when nothing is stored.</summary>
    [JsonIgnore(Condition = JsonIgnoreCondition.Never)]
    public string? FlagId { get; init; }

    /// <summary>True when this sample id was screened against this baseline before with the same values: this is the stored result.</summary>
    public bool Duplicate { get; init; }
}

/// <summary>One ratio that explains a sample's distance.</summary>
/// <param name="Label">The ratio's label: <c>Na/Cl</c>, or a named amalgamation ratio's <c>hardness/alkalis</c>.</param>
/// <param name="Value">The sample's value of the ratio, in ratio units (not its log).</param>
/// <param name="Z">z = (ln value − m) / s, with m and s the reference centre and spread of ln(ratio).</param>
/// <param name="Expected">The central 95% range of the reference samples in ratio units: [exp(m − 1.96 s), exp(m + 1.96 s)].</param>
public sealed record ReasonItem(string Label, double Value, double Z, IReadOnlyList<double> Expected);

/// <summary>A rule that a sample violates.</summary>
/// <param name="Label">The ratio's label.</param>
/// <param name="Value">The sample's value of the ratio, in ratio units.</param>
/// <param name="Min">The rule's lower limit, or absent.</param>
/// <param name="Max">The rule's upper limit, or absent.</param>
public sealed record RuleViolationItem(string Label, double Value, double? Min, double? Max);

/// <summary>A value of a screened sample that the zero policy replaced.</summary>
/// <param name="Part">The part.</param>
/// <param name="Value">The value used, in the sample's units.</param>
public sealed record ImputedValueItem(string Part, double Value);
