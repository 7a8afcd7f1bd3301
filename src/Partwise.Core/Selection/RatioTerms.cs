using Partwise.Core.Ratios;

namespace Partwise.Core.Selection;

/// <summary>
/// A ratio as a request names it, before it is resolved against a table: part names on each side, or the name of one
/// named amalgamation alone on a side (<c>{"num": ["hardness"], "den": ["Na"]}</c>).
/// </summary>
/// <param name="Numerator">Part names, or one amalgamation name.</param>
/// <param name="Denominator">Part names, or one amalgamation name; disjoint from the numerator's parts.</param>
/// <param name="Kind">Required when a side has more than one part (see <see cref="LogRatio.Create"/>); a side that names an
/// amalgamation implies <see cref="RatioKind.Amalgamation"/>.</param>
public sealed record RatioTerms(IReadOnlyList<string> Numerator, IReadOnlyList<string> Denominator, RatioKind? Kind = null);
