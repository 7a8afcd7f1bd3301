using System.ComponentModel.DataAnnotations;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;

namespace Partwise.Api.Shapes;

/// <summary>
/// One log-ratio (<c>{"num": [...], "den": [...], "kind": ...}</c>). One part on each side is a pairwise
/// log-ratio; with more on a side, <c>kind</c> is required: <c>amalgamation</c> ln(Σ num / Σ den) or
/// <c>balance</c> √(r s / (r + s)) ln(g(num) / g(den)) (Egozcue &amp; Pawlowsky-Glahn 2005).
/// </summary>
public sealed record RatioOption
{
    /// <summary>The kind names of the contract.</summary>
    public static readonly string[] Kinds = ["pairwise", "amalgamation", "balance"];

    /// <summary>Numerator part names (one or more).</summary>
    [Required]
    public IReadOnlyList<string>? Num { get; init; }

    /// <summary>Denominator part names (one or more, none in the numerator).</summary>
    [Required]
    public IReadOnlyList<string>? Den { get; init; }

    /// <summary><c>pairwise</c>, <c>amalgamation</c> or <c>balance</c>; required when a side has more than one part.</summary>
    [AllowedValues("pairwise", "amalgamation", "balance")]
    public string? Kind { get; init; }

    /// <summary>The Core ratio over <paramref name="parts"/>.</summary>
    /// <exception cref="CompositionException">400 for a missing side or unknown kind name; the Core's 422s otherwise.</exception>
    public LogRatio ToLogRatio(IReadOnlyList<string> parts, string pointer)
    {
        RatioKind? kind = Kind switch
        {
            null => null,
            "pairwise" => RatioKind.Pairwise,
            "amalgamation" => RatioKind.Amalgamation,
            "balance" => RatioKind.Balance,
            _ => throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/kind", $"The kind '{Kind}' is unknown; use one of {string.Join(", ", Kinds)}."),
        };
        var num = Num ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/num", "A ratio needs \"num\": the numerator part names.");
        var den = Den ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/den", "A ratio needs \"den\": the denominator part names.");
        return LogRatio.Create(parts, num, den, kind, pointer);
    }
}
