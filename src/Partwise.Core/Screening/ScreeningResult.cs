namespace Partwise.Core.Screening;

/// <summary>
/// The screening of one sample against a baseline. A flag is a statistical signal for review by a qualified
/// analyst, not a decision.
/// </summary>
/// <param name="SquaredDistance">d² = (y − μ)ᵀ Σ⁻¹ (y − μ), the squared Mahalanobis distance of the sample's coordinates.</param>
/// <param name="PValue">1 − F_χ²(d²; p): the chance that a sample like the reference ones lies at least this far out.</param>
/// <param name="ExceedsThreshold">d² &gt; the baseline's threshold χ²_p(cutoff).</param>
/// <param name="Flagged">The distance exceeds the threshold or at least one rule is violated.</param>
/// <param name="Reasons">The ratios with the largest |z|, largest first (see <see cref="ScreeningReason"/>).</param>
/// <param name="RuleViolations">Every rule the sample violates, in the baseline's rule order.</param>
public sealed record ScreeningResult(
    double SquaredDistance,
    double PValue,
    bool ExceedsThreshold,
    bool Flagged,
    IReadOnlyList<ScreeningReason> Reasons,
    IReadOnlyList<RuleViolation> RuleViolations)
{
    /// <summary>d = √d², the Mahalanobis distance itself.</summary>
    public double Distance => Math.Sqrt(SquaredDistance);
}

/// <summary>
/// One ratio that explains why a sample stands out: its value, how many reference standard deviations its log lies
/// from the reference centre, and the central 95% range of the reference samples in ratio units.
/// </summary>
/// <param name="Label">The ratio's label, e.g. <c>Na/Cl</c> or a named amalgamation ratio's label.</param>
/// <param name="Value">The sample's value of the ratio, in ratio units (not its log).</param>
/// <param name="Z">z = (ln value − m) / s with m and s the reference mean and standard deviation of ln(ratio).</param>
/// <param name="ExpectedLow">exp(m − 1.96 s).</param>
/// <param name="ExpectedHigh">exp(m + 1.96 s).</param>
public sealed record ScreeningReason(string Label, double Value, double Z, double ExpectedLow, double ExpectedHigh);
