using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Baselines;

/// <summary>
/// A screening baseline as stored and as <c>GET /v1/baselines/{id}</c> returns it: immutable and portable (posted as
/// <c>baseline</c> to <c>POST /v1/screenings</c>, it screens the same with nothing stored). Location and covariance
/// are in the baseline's own coordinates y = (ln x) A, with A the ilr <c>basis</c> or the log-contrasts of
/// <c>ratios</c>. Flags are statistical signals for review by a qualified analyst, not decisions.
/// </summary>
public sealed record BaselineDocument
{
    /// <summary>Opaque, unique id (assigned by the store; not needed to screen inline).</summary>
    public string? Id { get; init; }

    /// <summary>The name it was created under.</summary>
    public string? Name { get; init; }

    /// <summary>Its version under the name: 1, then one more for each refit under the same name.</summary>
    public int? Version { get; init; }

    /// <summary>When it was created (UTC).</summary>
    public DateTimeOffset? CreatedAt { get; init; }

    /// <summary>When it was retired (UTC); null while it takes screenings. Not part of the stored document: the service adds it.</summary>
    [JsonIgnore(Condition = JsonIgnoreCondition.Never)]
    public DateTimeOffset? RetiredAt { get; init; }

    /// <summary>The free-text description given at creation, or absent.</summary>
    public string? Description { get; init; }

    /// <summary>The part names, in the order of the basis rows; a screened sample has a value for each of them and no other.</summary>
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>
    /// The zero policy of the reference samples, applied to every screened sample on its own (for multiplicative
    /// replacement the row sum is the sample's own).
    /// </summary>
    public ZerosOption? Zeros { get; init; }

    /// <summary>The coordinates' <c>type</c>: <c>ilr</c>, <c>ratios</c> or <c>selection</c>.</summary>
    public BaselineCoordinatesOption? Coordinates { get; init; }

    /// <summary>The coordinate ratios, in the order of <c>location</c> (for <c>ratios</c> and <c>selection</c>); null for ilr.</summary>
    [JsonIgnore(Condition = JsonIgnoreCondition.Never)]
    public IReadOnlyList<RatioOption>? Ratios { get; init; }

    /// <summary>For ilr: the orthonormal basis V, J rows (parts) × J − 1 columns, y = V' ln x; null otherwise.</summary>
    [JsonIgnore(Condition = JsonIgnoreCondition.Never)]
    public RowMajor? Basis { get; init; }

    /// <summary>The location μ of the reference coordinates (length p).</summary>
    public IReadOnlyList<double>? Location { get; init; }

    /// <summary>The scatter Σ of the reference coordinates (p × p, symmetric positive definite).</summary>
    public RowMajor? Covariance { get; init; }

    /// <summary>How μ and Σ were estimated: <c>robust</c> (reweighted MCD, FAST-MCD) or <c>classical</c> (mean and covariance, divisor n − 1).</summary>
    public string? Scatter { get; init; }

    /// <summary>The quantile of χ²_p whose value is the threshold, in (0, 1).</summary>
    public double? Cutoff { get; init; }

    /// <summary>The d² threshold χ²_p(cutoff): a sample with d² above it is flagged.</summary>
    public double? Threshold { get; init; }

    /// <summary>p, the degrees of freedom of the chi-square reference: the number of coordinates.</summary>
    public int? DegreesOfFreedom { get; init; }

    /// <summary>The number of reference samples.</summary>
    public int? ReferenceCount { get; init; }

    /// <summary>How many reference samples the baseline itself flags (distance or rule).</summary>
    public int? ReferenceFlagged { get; init; }

    /// <summary>For <c>selection</c>: the fraction of the reference samples' log-ratio variance the chosen ratios explain (Greenacre 2019); null otherwise.</summary>
    [JsonIgnore(Condition = JsonIgnoreCondition.Never)]
    public double? Explained { get; init; }

    /// <summary>Rules on ratio values, each with its label.</summary>
    public IReadOnlyList<RuleOption>? Rules { get; init; }

    /// <summary>The named amalgamations (name to parts) that named ratios refer to.</summary>
    public IReadOnlyDictionary<string, IReadOnlyList<string>>? Amalgamations { get; init; }

    /// <summary>Ratios between named amalgamations, with the reference location and scale of their logs, used as reasons.</summary>
    public IReadOnlyList<NamedRatioItem>? NamedRatios { get; init; }
}

/// <summary>A ratio between two named amalgamations, with its reference location and scale on the log scale.</summary>
/// <param name="Label">The label, <c>num/den</c> by amalgamation name.</param>
/// <param name="Num">The numerator amalgamation's name (a key of <c>amalgamations</c>).</param>
/// <param name="Den">The denominator amalgamation's name; no part in common with the numerator.</param>
/// <param name="Location">The centre of ln(Σ num / Σ den) over the reference samples (median for robust, mean for classical).</param>
/// <param name="Scale">Its spread (&gt; 0): 1.4826 × median absolute deviation for robust, standard deviation (n − 1) for classical.</param>
public sealed record NamedRatioItem(string? Label, string? Num, string? Den, double? Location, double? Scale);
