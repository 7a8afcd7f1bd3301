namespace Partwise.Core.Selection;

/// <summary>
/// The second moments a distributed engine computes in place of a table, for <see cref="RatioSelection.Run(SelectionMoments, double[], RatioSelectionOptions, CancellationToken)"/>.
/// </summary>
/// <param name="Names">The J part names, then the names of the named amalgamations in the order of the options.</param>
/// <param name="Covariance">The (J + m) × (J + m) sample covariance, divisor n − 1, of ln x_1 … ln x_J and then
/// ln(Σ_A x) of each named amalgamation; symmetric and positive semi-definite.</param>
/// <param name="Count">The number of samples n behind the covariance, n ≥ 2.</param>
public sealed record SelectionMoments(IReadOnlyList<string> Names, IReadOnlyList<double[]> Covariance, long Count);
