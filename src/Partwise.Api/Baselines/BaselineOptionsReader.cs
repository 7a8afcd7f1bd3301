using System.Globalization;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Screening;

namespace Partwise.Api.Baselines;

/// <summary>Reads the options shared by a baseline request and a baseline document into the math library's terms.</summary>
public static class BaselineOptionsReader
{
    /// <summary>The scatter names of the contract.</summary>
    public static readonly string[] ScatterNames = ["robust", "classical"];

    /// <summary>The scatter method for its wire name; absent is robust when <paramref name="required"/> is false.</summary>
    /// <exception cref="CompositionException">400 at <paramref name="pointer"/> for an unknown or (when required) missing name.</exception>
    public static ScatterMethod Scatter(string? name, string pointer, bool required = false) => name switch
    {
        null when !required => ScatterMethod.Robust,
        null => throw new CompositionException(ProblemTypes.InvalidInput, pointer, "The baseline needs \"scatter\": robust or classical."),
        "robust" => ScatterMethod.Robust,
        "classical" => ScatterMethod.Classical,
        _ => throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The scatter '{name}' is unknown; use robust or classical."),
    };

    /// <summary>The wire name of a scatter method.</summary>
    public static string ScatterName(ScatterMethod method) => method == ScatterMethod.Robust ? "robust" : "classical";

    /// <summary>
    /// A coordinate ratio: pairwise or balance (linear in ln x). An amalgamation is a 422
    /// <see cref="ProblemTypes.InvalidRatio"/> pointing at the ratio.
    /// </summary>
    public static LogRatio CoordinateRatio(RatioOption? option, IReadOnlyList<string> parts, string pointer)
    {
        var ratio = (option ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer, "A ratio must be an object, not null.")).ToLogRatio(parts, pointer);
        return ratio.Kind == RatioKind.Amalgamation
            ? throw new CompositionException(
                ProblemTypes.InvalidRatio,
                pointer,
                $"The amalgamation '{ratio.Label}' cannot be a coordinate: ln(Σ num / Σ den) is not linear in the logs of the parts, so no Mahalanobis distance is defined over it. Use pairwise or balance ratios as coordinates; an amalgamation can be a rule or a named ratio.")
            : ratio;
    }

    /// <summary>The rules over <paramref name="parts"/>; problems at <c>{pointer}/k/ratio</c>.</summary>
    public static RatioRule[] Rules(IReadOnlyList<RuleOption>? rules, IReadOnlyList<string> parts, string pointer)
    {
        if (rules is null)
        {
            return [];
        }

        var result = new RatioRule[rules.Count];
        for (var k = 0; k < rules.Count; k++)
        {
            var at = string.Create(CultureInfo.InvariantCulture, $"{pointer}/{k}");
            var rule = rules[k] ?? throw new CompositionException(ProblemTypes.InvalidInput, at, "A rule must be an object, not null.");
            var ratio = rule.Ratio ?? throw new CompositionException(ProblemTypes.InvalidInput, at + "/ratio", "A rule needs \"ratio\": the ratio whose value it limits.");
            result[k] = new RatioRule(ratio.ToLogRatio(parts, at + "/ratio"), rule.Min, rule.Max);
        }

        return result;
    }

    /// <summary>The rules as a document lists them, with labels.</summary>
    public static RuleOption[] RuleItems(IReadOnlyList<RatioRule> rules, IReadOnlyList<string> parts) =>
        [.. rules.Select(r => new RuleOption { Ratio = ToOption(r.Ratio, parts), Min = r.Min, Max = r.Max, Label = r.Ratio.Label })];

    /// <summary>Named amalgamations: each name non-empty with one or more parts of <paramref name="parts"/>; problems at <c>{pointer}/name</c>.</summary>
    public static Dictionary<string, int[]> Amalgamations(IReadOnlyDictionary<string, IReadOnlyList<string>>? amalgamations, IReadOnlyList<string> parts, string pointer)
    {
        var result = new Dictionary<string, int[]>(StringComparer.Ordinal);
        if (amalgamations is null)
        {
            return result;
        }

        foreach (var (name, members) in amalgamations)
        {
            var at = $"{pointer}/{JsonPointer.Escape(name)}";
            if (string.IsNullOrWhiteSpace(name))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, at, "An amalgamation needs a non-empty name.");
            }

            if (members is not { Count: > 0 })
            {
                throw new CompositionException(ProblemTypes.InvalidInput, at, $"The amalgamation '{name}' needs one or more parts.");
            }

            var indices = new int[members.Count];
            for (var k = 0; k < members.Count; k++)
            {
                var index = parts.IndexOf(members[k]);
                indices[k] = index >= 0
                    ? index
                    : throw new CompositionException(ProblemTypes.UnknownPart, string.Create(CultureInfo.InvariantCulture, $"{at}/{k}"), $"The table has no part named '{members[k]}'.");
                if (Array.IndexOf(indices, index, 0, k) >= 0)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, string.Create(CultureInfo.InvariantCulture, $"{at}/{k}"), $"The part '{members[k]}' appears twice in the amalgamation '{name}'.");
                }
            }

            result[name] = indices;
        }

        return result;
    }

    /// <summary>The ratio between two named amalgamations, labelled by their names.</summary>
    public static LogRatio NamedRatio(IReadOnlyList<string> parts, string num, int[] numParts, string den, int[] denParts, string pointer) =>
        LogRatio.FromIndices(parts, numParts, denParts, RatioKind.Amalgamation, pointer, num, den);

    /// <summary>The wire form of a ratio over <paramref name="parts"/>, with its kind spelled out.</summary>
    public static RatioOption ToOption(LogRatio ratio, IReadOnlyList<string> parts)
    {
        ArgumentNullException.ThrowIfNull(ratio);
        ArgumentNullException.ThrowIfNull(parts);
        return new RatioOption
        {
            Num = [.. ratio.Numerator.Select(i => parts[i])],
            Den = [.. ratio.Denominator.Select(i => parts[i])],
            Kind = ratio.Kind switch
            {
                RatioKind.Pairwise => "pairwise",
                RatioKind.Amalgamation => "amalgamation",
                _ => "balance",
            },
        };
    }

    /// <summary>The same problem with each pointer passed through <paramref name="map"/>.</summary>
    public static CompositionException Rebase(CompositionException exception, Func<string, string> map)
    {
        ArgumentNullException.ThrowIfNull(exception);
        ArgumentNullException.ThrowIfNull(map);
        return new CompositionException(exception.ProblemType, exception.Message, [.. exception.Errors.Select(e => e with { Pointer = map(e.Pointer) })]);
    }

    private static int IndexOf(this IReadOnlyList<string> parts, string name)
    {
        for (var j = 0; j < parts.Count; j++)
        {
            if (string.Equals(parts[j], name, StringComparison.Ordinal))
            {
                return j;
            }
        }

        return -1;
    }
}
