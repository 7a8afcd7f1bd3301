using System.ComponentModel.DataAnnotations;
using System.Globalization;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;

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
        var kind = ParseKind(pointer);
        var num = Num ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/num", "A ratio needs \"num\": the numerator part names.");
        var den = Den ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/den", "A ratio needs \"den\": the denominator part names.");
        return LogRatio.Create(parts, num, den, kind, pointer);
    }

    /// <summary>The request's terms, unresolved: a side may also name one named amalgamation (for ratio selection).</summary>
    /// <exception cref="CompositionException">400 for a missing side or an unknown kind name.</exception>
    public RatioTerms ToTerms(string pointer)
    {
        var num = Num ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/num", "A ratio needs \"num\": the numerator part names.");
        var den = Den ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/den", "A ratio needs \"den\": the denominator part names.");
        return new RatioTerms(num, den, ParseKind(pointer));
    }

    /// <summary>The contract's shape of a resolved ratio: part names on each side, and its kind.</summary>
    /// <param name="ratio">The ratio.</param>
    /// <param name="parts">The part names its indices refer to.</param>
    public static RatioOption From(LogRatio ratio, IReadOnlyList<string> parts)
    {
        ArgumentNullException.ThrowIfNull(ratio);
        ArgumentNullException.ThrowIfNull(parts);
        return new RatioOption
        {
            Num = [.. ratio.Numerator.Select(j => parts[j])],
            Den = [.. ratio.Denominator.Select(j => parts[j])],
            Kind = ratio.Kind switch
            {
                RatioKind.Amalgamation => "amalgamation",
                RatioKind.Balance => "balance",
                _ => "pairwise",
            },
        };
    }

    /// <summary>
    /// Resolves a list of ratios (<c>ratios</c> in the request) over <paramref name="parts"/>, each with its pointer
    /// <c>{pointer}/i</c>.
    /// </summary>
    /// <exception cref="CompositionException">400 when the list is missing or empty or holds null; the ratios' own problems.</exception>
    public static LogRatio[] ToLogRatios(IReadOnlyList<RatioOption?>? ratios, IReadOnlyList<string> parts, string pointer)
    {
        if (ratios is not { Count: > 0 })
        {
            throw new CompositionException(ProblemTypes.InvalidInput, pointer, "The request needs \"ratios\": a list of one or more ratios {\"num\": [...], \"den\": [...]}.");
        }

        var result = new LogRatio[ratios.Count];
        for (var i = 0; i < ratios.Count; i++)
        {
            var at = string.Create(CultureInfo.InvariantCulture, $"{pointer}/{i}");
            result[i] = (ratios[i] ?? throw new CompositionException(ProblemTypes.InvalidInput, at, "A ratio must be an object, not null.")).ToLogRatio(parts, at);
        }

        return result;
    }

    /// <summary>
    /// Pairwise ratios from the query of a <c>text/csv</c> request: every <c>ratio=Na/Cl</c> parameter, in order (part
    /// names must not contain <c>/</c> there; other ratios need a JSON body). Null when there is none.
    /// </summary>
    /// <exception cref="CompositionException">400 for a value that is not two names around one <c>/</c>.</exception>
    public static RatioOption[]? FromQuery(IQueryCollection query, string pointer = "/ratios")
    {
        ArgumentNullException.ThrowIfNull(query);
        if (!query.TryGetValue("ratio", out var values) || values.Count == 0)
        {
            return null;
        }

        var result = new RatioOption[values.Count];
        for (var i = 0; i < values.Count; i++)
        {
            var sides = (values[i] ?? "").Split('/');
            if (sides.Length != 2 || sides[0].Length == 0 || sides[1].Length == 0)
            {
                throw new CompositionException(
                    ProblemTypes.InvalidInput,
                    string.Create(CultureInfo.InvariantCulture, $"{pointer}/{i}"),
                    $"The query parameter 'ratio' is a pairwise ratio 'num/den' such as 'Na/Cl'; '{values[i]}' is not. Other ratios need a JSON body.");
            }

            result[i] = new RatioOption { Num = [sides[0]], Den = [sides[1]] };
        }

        return result;
    }

    private RatioKind? ParseKind(string pointer) => Kind switch
    {
        null => null,
        "pairwise" => RatioKind.Pairwise,
        "amalgamation" => RatioKind.Amalgamation,
        "balance" => RatioKind.Balance,
        _ => throw new CompositionException(ProblemTypes.InvalidInput, pointer + "/kind", $"The kind '{Kind}' is unknown; use one of {string.Join(", ", Kinds)}."),
    };
}
