using Partwise.Core.Ratios;

namespace Partwise.Core.Selection;

/// <summary>The path of a stepwise ratio selection.</summary>
/// <param name="Parts">The table's (or the moments') part names, which the ratios' indices refer to.</param>
/// <param name="TotalVariance">TV = Σ_j w_j var(clr_j), with the divisor <see cref="Divisor"/>.</param>
/// <param name="Divisor">Always <c>"n"</c>: weighted analyses divide by n (fractions explained do not depend on it).</param>
/// <param name="Steps">One entry per ratio, forced ones first.</param>
/// <param name="Graph">The graph of the chosen ratios.</param>
/// <param name="Invertible">Whether the chosen ratios determine the composition (see <see cref="RatioReconstruction.IsInvertible"/>).</param>
public sealed record RatioSelectionResult(
    IReadOnlyList<string> Parts,
    double TotalVariance,
    string Divisor,
    IReadOnlyList<SelectionStep> Steps,
    RatioGraph Graph,
    bool Invertible);

/// <summary>One step of the selection path.</summary>
/// <param name="Ratio">The ratio added at this step.</param>
/// <param name="Label">Its label: <c>Na/Cl</c>, <c>hardness/Na</c>, <c>hardness/alkalis</c>, <c>(Ca+Mg)/Na</c>, <c>g(Ca,Mg)/g(Na,K)</c>.</param>
/// <param name="Explained">The cumulative fraction of the total log-ratio variance explained by the ratios so far, in [0, 1].</param>
/// <param name="Gain">The increase of <see cref="Explained"/> at this step.</param>
/// <param name="Procrustes">The Procrustes correlation between the samples in all log-ratios and in the ratios so far, in [0, 1].</param>
/// <param name="Forced">Whether the ratio was forced in rather than chosen.</param>
public sealed record SelectionStep(LogRatio Ratio, string Label, double Explained, double Gain, double Procrustes, bool Forced);
