using System.Globalization;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Reads the simple options of a <c>text/csv</c> request from its query string. Problems point at the option's
/// place in the equivalent JSON request (<c>fraction</c> at <c>/zeros/fraction</c>), and say which query parameter
/// was meant.
/// </summary>
public static class QueryOptions
{
    /// <summary>The single value of <paramref name="name"/>, or null when it is absent.</summary>
    /// <exception cref="CompositionException">400 when the parameter is given more than once.</exception>
    public static string? Text(IQueryCollection query, string name, string pointer)
    {
        ArgumentNullException.ThrowIfNull(query);
        if (!query.TryGetValue(name, out var values) || values.Count == 0)
        {
            return null;
        }

        return values.Count == 1
            ? values[0]
            : throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The query parameter '{name}' is given {values.Count} times; give it once.");
    }

    /// <summary>The value of <paramref name="name"/> as a finite number, or null when it is absent.</summary>
    /// <exception cref="CompositionException">400 when it is not a finite number in invariant notation.</exception>
    public static double? Number(IQueryCollection query, string name, string pointer)
    {
        var text = Text(query, name, pointer);
        if (text is null)
        {
            return null;
        }

        return double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) && double.IsFinite(value)
            ? value
            : throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The query parameter '{name}' is not a finite number (use a dot for decimals: 0.65).");
    }

    /// <summary>
    /// A list given as comma-separated values, in one parameter or repeated (<c>parts=Ca,Mg&amp;parts=Na</c>); null
    /// when the parameter is absent.
    /// </summary>
    public static string[]? List(IQueryCollection query, string name)
    {
        ArgumentNullException.ThrowIfNull(query);
        return query.TryGetValue(name, out var values) && values.Count > 0
            ? [.. values.SelectMany(v => (v ?? "").Split(',', StringSplitOptions.TrimEntries))]
            : null;
    }

    /// <summary>Every parameter named <c>prefix.key</c>, as a map from key to finite number; null when there is none.</summary>
    /// <exception cref="CompositionException">400 when a value is not a finite number.</exception>
    public static Dictionary<string, double>? NumberMap(IQueryCollection query, string prefix, string pointer)
    {
        ArgumentNullException.ThrowIfNull(query);
        Dictionary<string, double>? map = null;
        foreach (var key in query.Keys)
        {
            if (key.Length > prefix.Length + 1 && key.StartsWith(prefix + ".", StringComparison.Ordinal))
            {
                var name = key[(prefix.Length + 1)..];
                map ??= new Dictionary<string, double>(StringComparer.Ordinal);
                map[name] = Number(query, key, $"{pointer}/{JsonPointer.Escape(name)}")!.Value;
            }
        }

        return map;
    }
}
