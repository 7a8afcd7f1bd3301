using Partwise.Core.Ratios;

namespace Partwise.Core.Screening;

/// <summary>
/// A limit on the value of one ratio, in ratio units (x_A / x_B, or Σ_A x / Σ_B x for an amalgamation; e^b for a
/// balance b), not on its logarithm. A sample violates the rule when its value is below <see cref="Min"/> or above
/// <see cref="Max"/>; a violated rule flags the sample whatever its distance.
/// </summary>
/// <param name="Ratio">The ratio, built over the baseline's parts.</param>
/// <param name="Min">The lowest acceptable value, or null for no lower limit.</param>
/// <param name="Max">The highest acceptable value, or null for no upper limit. At least one limit is given; Min ≤ Max.</param>
public sealed record RatioRule(LogRatio Ratio, double? Min, double? Max);

/// <summary>A rule that a sample violates: the ratio's label, the sample's value and the limits it broke.</summary>
/// <param name="Label">The ratio's label, e.g. <c>Na/Cl</c>.</param>
/// <param name="Value">The sample's value of the ratio, in ratio units.</param>
/// <param name="Min">The rule's lower limit, or null.</param>
/// <param name="Max">The rule's upper limit, or null.</param>
public sealed record RuleViolation(string Label, double Value, double? Min, double? Max);

/// <summary>
/// The reference location and scale of one named ratio (typically between amalgamations, which are not linear in
/// ln x and so cannot be read off the clr-form scatter), on the log scale.
/// </summary>
/// <param name="Ratio">The ratio, built over the baseline's parts.</param>
/// <param name="Location">The centre of ln(ratio) over the reference samples.</param>
/// <param name="Scale">The spread of ln(ratio) over the reference samples (&gt; 0), in the role of a standard deviation.</param>
public sealed record RatioBaseline(LogRatio Ratio, double Location, double Scale);
