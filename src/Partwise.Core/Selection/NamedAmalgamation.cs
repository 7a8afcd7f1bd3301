namespace Partwise.Core.Selection;

/// <summary>
/// A named amalgamation: the sum of a set of parts under a name the analyst chose (for example
/// <c>hardness = Ca + Mg</c>), usable in ratios as ln(Σ_A x / …) and labelled by its name (<c>hardness/Na</c>).
/// </summary>
/// <param name="Name">A non-empty name that is not a part name and not used by another amalgamation.</param>
/// <param name="Parts">Two or more distinct part names of the table.</param>
/// <remarks>Amalgamation log-ratios: Aitchison 1986, The Statistical Analysis of Compositional Data, ch. 5; their use
/// beside pairwise log-ratios in stepwise selection: Greenacre 2019, Math. Geosci. 51:649-682.</remarks>
public sealed record NamedAmalgamation(string Name, IReadOnlyList<string> Parts);
