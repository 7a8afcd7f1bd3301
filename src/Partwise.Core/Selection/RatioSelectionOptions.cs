namespace Partwise.Core.Selection;

/// <summary>The options of a stepwise ratio selection (<see cref="RatioSelection"/>), as the request gives them.</summary>
public sealed record RatioSelectionOptions
{
    /// <summary>Named amalgamations, in the order given (the order candidates are enumerated in). JSON pointer <c>/amalgamations/{name}</c>.</summary>
    public IReadOnlyList<NamedAmalgamation> Amalgamations { get; init; } = [];

    /// <summary>Ratios that are always in, applied first in this order. JSON pointer <c>/force/i</c>.</summary>
    public IReadOnlyList<RatioTerms> Force { get; init; } = [];

    /// <summary>Parts never used by a candidate (nor are amalgamations containing them). JSON pointer <c>/exclude/i</c>.</summary>
    public IReadOnlyList<string> Exclude { get; init; } = [];

    /// <summary>
    /// The most ratios in the result, forced ones included; default: the number of usable parts minus one, or the number
    /// of forced ratios if that is larger. Valid: ≥ 1 and ≥ the number of forced ratios. JSON pointer <c>/stop/maxRatios</c>.
    /// </summary>
    public int? MaxRatios { get; init; }

    /// <summary>
    /// Stop at the first step whose cumulative explained fraction reaches this (that step is included); default 1.
    /// Valid: (0, 1]. JSON pointer <c>/stop/explained</c>.
    /// </summary>
    public double? Explained { get; init; }
}
