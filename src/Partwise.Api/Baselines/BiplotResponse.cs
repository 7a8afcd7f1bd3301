using System.Text.Json.Serialization;

namespace Partwise.Api.Baselines;

/// <summary>
/// The principal axes of a baseline's clr-form scatter for a biplot: parts at their standard coordinates, the
/// reference ellipse at the baseline's threshold, and flagged samples at their scores (principal coordinates).
/// </summary>
/// <param name="BaselineId">The baseline.</param>
/// <param name="Parts">The part names, in the order of <paramref name="PartCoordinates"/>.</param>
/// <param name="Dimensions">The axes shown: 2, or 1 for a baseline with one coordinate.</param>
/// <param name="Variances">λ_1 ≥ … ≥ λ_p, the variances along all p principal axes of the clr-form scatter.</param>
/// <param name="TotalVariance">trace S_clr = Σ λ_k, the total log-ratio variance of the baseline's scatter.</param>
/// <param name="Explained">λ_k / trace for the axes shown.</param>
/// <param name="PartCoordinates">Per part, its standard coordinates v_jk on the axes shown (the arrow tips, before any scaling for display).</param>
/// <param name="Ellipse">The reference ellipse.</param>
/// <param name="Samples">The requested flags, in the order asked, with their scores.</param>
public sealed record BiplotResponse(
    string BaselineId,
    IReadOnlyList<string> Parts,
    int Dimensions,
    IReadOnlyList<double> Variances,
    double TotalVariance,
    IReadOnlyList<double> Explained,
    IReadOnlyList<IReadOnlyList<double>> PartCoordinates,
    BiplotEllipse Ellipse,
    IReadOnlyList<BiplotSample> Samples);

/// <summary>
/// The reference ellipse s₁²/λ₁ + s₂²/λ₂ = threshold, centred at the origin with its axes along the biplot's axes: the
/// shadow on the plane of the ellipsoid d² = threshold. A sample outside it is beyond the threshold; one inside may
/// still be beyond it along the other axes.
/// </summary>
/// <param name="Cutoff">The baseline's χ² quantile.</param>
/// <param name="Threshold">The d² threshold χ²_p(cutoff).</param>
/// <param name="SemiAxes">√(threshold · λ_k) for the axes shown.</param>
public sealed record BiplotEllipse(double Cutoff, double Threshold, IReadOnlyList<double> SemiAxes);

/// <summary>A flagged sample placed on the biplot.</summary>
/// <param name="FlagId">The flag.</param>
/// <param name="SampleId">The sample's id.</param>
/// <param name="Status">The flag's status.</param>
/// <param name="Scores">(c − μ_clr)ᵀ v_k on the axes shown, with c the clr of the sample after the baseline's zero policy; null when the flag was raised before the service kept sample values.</param>
/// <param name="PlaneSquaredDistance">s₁²/λ₁ + s₂²/λ₂, the part of d² the plane shows (above the threshold: outside the ellipse); null with the scores.</param>
/// <param name="SquaredDistance">d² over all axes (equals the screening's); null with the scores.</param>
public sealed record BiplotSample(
    string FlagId,
    string SampleId,
    string Status,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] IReadOnlyList<double>? Scores,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] double? PlaneSquaredDistance,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] double? SquaredDistance);
