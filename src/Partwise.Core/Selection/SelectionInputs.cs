using System.Globalization;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;

namespace Partwise.Core.Selection;

/// <summary>
/// The options of a selection resolved against the part names: amalgamations as part indices, excluded parts, forced
/// ratios as <see cref="LogRatio"/>s with their columns, and the stopping rule. Every problem points into the request.
/// </summary>
internal sealed class SelectionInputs
{
    private SelectionInputs(
        IReadOnlyList<string> parts,
        IReadOnlyList<NamedAmalgamation> amalgamations,
        int[][] named,
        bool[] excluded,
        LogRatio[] forced,
        AugmentedColumns columns,
        int maxRatios,
        double target)
    {
        Parts = parts;
        Amalgamations = amalgamations;
        Named = named;
        Excluded = excluded;
        Forced = forced;
        Columns = columns;
        MaxRatios = maxRatios;
        Target = target;
    }

    public IReadOnlyList<string> Parts { get; }

    public IReadOnlyList<NamedAmalgamation> Amalgamations { get; }

    /// <summary>The named amalgamations' part indices, in the order given.</summary>
    public int[][] Named { get; }

    public bool[] Excluded { get; }

    public LogRatio[] Forced { get; }

    /// <summary>Parts, named sums, then sums that forced ratios need (only with a table).</summary>
    public AugmentedColumns Columns { get; }

    public int MaxRatios { get; }

    public double Target { get; }

    public static SelectionInputs Resolve(IReadOnlyList<string> parts, double[] weights, RatioSelectionOptions options, bool allowAddedSums)
    {
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(weights);
        CheckWeights(weights, parts.Count);
        var amalgamations = options.Amalgamations ?? [];
        var named = ResolveAmalgamations(parts, amalgamations);
        var excluded = ResolveExclude(parts, options.Exclude ?? []);
        var usable = excluded.Count(e => !e);
        if (usable < 2)
        {
            throw new CompositionException(ProblemTypes.InvalidOption, "/exclude", $"Only {usable} part(s) are left after the exclusions; a ratio needs two.");
        }

        var columns = new AugmentedColumns(parts.Count, named);
        var force = options.Force ?? [];
        var forced = new LogRatio[force.Count];
        for (var i = 0; i < force.Count; i++)
        {
            var pointer = string.Create(CultureInfo.InvariantCulture, $"/force/{i}");
            var ratio = ResolveRatio(parts, amalgamations, named, force[i], pointer);
            foreach (var j in ratio.Numerator.Concat(ratio.Denominator))
            {
                if (excluded[j])
                {
                    throw new CompositionException(ProblemTypes.InvalidOption, pointer, $"The forced ratio {ratio.Label} uses '{parts[j]}', which is excluded.");
                }
            }

            if (ratio.Kind == RatioKind.Amalgamation)
            {
                foreach (var side in new[] { ratio.Numerator, ratio.Denominator })
                {
                    if (allowAddedSums)
                    {
                        columns.FindOrAdd(side);
                    }
                    else if (columns.Find(side) < 0)
                    {
                        throw new CompositionException(
                            ProblemTypes.InvalidRatio,
                            pointer,
                            $"From moments, each side of an amalgamation ratio must be one part or a named amalgamation; {ratio.Label} has a sum that the moments do not hold.");
                    }
                }
            }

            forced[i] = ratio;
        }

        var maxRatios = options.MaxRatios ?? Math.Max(usable - 1, forced.Length);
        if (maxRatios < 1 || maxRatios < forced.Length)
        {
            throw new CompositionException(
                ProblemTypes.InvalidOption,
                "/stop/maxRatios",
                string.Create(CultureInfo.InvariantCulture, $"maxRatios must be at least 1 and at least the number of forced ratios ({forced.Length}); it is {maxRatios}."));
        }

        var target = options.Explained ?? 1.0;
        if (!(target > 0 && target <= 1))
        {
            throw new CompositionException(ProblemTypes.InvalidOption, "/stop/explained", "stop.explained must be a fraction in (0, 1].");
        }

        return new SelectionInputs(parts, amalgamations, named, excluded, forced, columns, maxRatios, target);
    }

    internal static void CheckWeights(double[] weights, int partCount)
    {
        if (weights.Length != partCount)
        {
            throw new ArgumentException($"There are {weights.Length} weights for {partCount} parts.", nameof(weights));
        }

        var sum = 0.0;
        foreach (var w in weights)
        {
            if (!double.IsFinite(w) || w <= 0)
            {
                throw new ArgumentException("Part weights must be positive and finite.", nameof(weights));
            }

            sum += w;
        }

        if (Math.Abs(sum - 1) > 1e-9)
        {
            throw new ArgumentException("Part weights must sum to 1 (resolve them with PartWeights.Resolve).", nameof(weights));
        }
    }

    private static int[][] ResolveAmalgamations(IReadOnlyList<string> parts, IReadOnlyList<NamedAmalgamation> amalgamations)
    {
        var result = new int[amalgamations.Count][];
        var names = new HashSet<string>(StringComparer.Ordinal);
        for (var a = 0; a < amalgamations.Count; a++)
        {
            var amalgamation = amalgamations[a] ?? throw new ArgumentException("An amalgamation is null.", nameof(amalgamations));
            var name = amalgamation.Name ?? "";
            var pointer = "/amalgamations/" + JsonPointer.Escape(name);
            if (name.Trim().Length == 0)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, pointer, "An amalgamation needs a non-empty name.");
            }

            if (!names.Add(name))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The amalgamation name '{name}' is used twice.");
            }

            if (parts.Contains(name, StringComparer.Ordinal))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The amalgamation name '{name}' is also a part name; labels would be ambiguous.");
            }

            var members = amalgamation.Parts ?? [];
            if (members.Count < 2)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The amalgamation '{name}' needs at least two parts; one part is a part.");
            }

            var indices = new int[members.Count];
            for (var i = 0; i < members.Count; i++)
            {
                var itemPointer = string.Create(CultureInfo.InvariantCulture, $"{pointer}/{i}");
                var j = IndexOf(parts, members[i]);
                if (j < 0)
                {
                    throw new CompositionException(ProblemTypes.UnknownPart, itemPointer, $"There is no part named '{members[i]}'.");
                }

                if (Array.IndexOf(indices, j, 0, i) >= 0)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, itemPointer, $"The part '{members[i]}' appears twice in '{name}'.");
                }

                indices[i] = j;
            }

            result[a] = indices;
        }

        return result;
    }

    private static bool[] ResolveExclude(IReadOnlyList<string> parts, IReadOnlyList<string> exclude)
    {
        var excluded = new bool[parts.Count];
        for (var i = 0; i < exclude.Count; i++)
        {
            var j = IndexOf(parts, exclude[i]);
            if (j < 0)
            {
                throw new CompositionException(ProblemTypes.UnknownPart, string.Create(CultureInfo.InvariantCulture, $"/exclude/{i}"), $"There is no part named '{exclude[i]}'.");
            }

            excluded[j] = true;
        }

        return excluded;
    }

    /// <summary>
    /// Resolves named terms to a ratio: a side is part names or one amalgamation name alone; a side that names an amalgamation,
    /// or whose parts equal one, carries the amalgamation's name in the label.
    /// </summary>
    internal static LogRatio ResolveRatio(
        IReadOnlyList<string> parts,
        IReadOnlyList<NamedAmalgamation> amalgamations,
        int[][] named,
        RatioTerms terms,
        string pointer)
    {
        if (terms is null)
        {
            throw new CompositionException(ProblemTypes.InvalidRatio, pointer, "The ratio is missing.");
        }

        var (num, numName) = ResolveSide(parts, amalgamations, named, terms.Numerator, pointer + "/num");
        var (den, denName) = ResolveSide(parts, amalgamations, named, terms.Denominator, pointer + "/den");
        var kind = terms.Kind;
        if (numName is not null || denName is not null)
        {
            if (kind is not null && kind != RatioKind.Amalgamation)
            {
                throw new CompositionException(ProblemTypes.InvalidRatio, pointer + "/kind", "A named amalgamation is a sum of parts, so its ratios have kind \"amalgamation\".");
            }

            kind = RatioKind.Amalgamation;
        }

        if (kind == RatioKind.Amalgamation)
        {
            numName ??= NameOf(amalgamations, named, num);
            denName ??= NameOf(amalgamations, named, den);
        }

        return LogRatio.FromIndices(parts, num, den, kind, pointer, numName, denName);
    }

    private static (int[] Side, string? Name) ResolveSide(
        IReadOnlyList<string> parts,
        IReadOnlyList<NamedAmalgamation> amalgamations,
        int[][] named,
        IReadOnlyList<string>? names,
        string pointer)
    {
        if (names is null || names.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidRatio, pointer, "Each side of a ratio needs at least one part.");
        }

        if (names.Count == 1)
        {
            for (var a = 0; a < amalgamations.Count; a++)
            {
                if (string.Equals(amalgamations[a].Name, names[0], StringComparison.Ordinal))
                {
                    return ((int[])named[a].Clone(), amalgamations[a].Name);
                }
            }
        }

        var side = new int[names.Count];
        for (var i = 0; i < names.Count; i++)
        {
            var itemPointer = string.Create(CultureInfo.InvariantCulture, $"{pointer}/{i}");
            var j = IndexOf(parts, names[i]);
            if (j < 0)
            {
                if (amalgamations.Any(a => string.Equals(a.Name, names[i], StringComparison.Ordinal)))
                {
                    throw new CompositionException(ProblemTypes.InvalidRatio, itemPointer, $"The amalgamation '{names[i]}' must stand alone on its side of the ratio.");
                }

                throw new CompositionException(ProblemTypes.UnknownPart, itemPointer, $"There is no part or amalgamation named '{names[i]}'.");
            }

            side[i] = j;
        }

        return (side, null);
    }

    private static string? NameOf(IReadOnlyList<NamedAmalgamation> amalgamations, int[][] named, int[] side)
    {
        if (side.Length < 2)
        {
            return null;
        }

        for (var a = 0; a < named.Length; a++)
        {
            if (named[a].Length == side.Length && side.All(j => Array.IndexOf(named[a], j) >= 0))
            {
                return amalgamations[a].Name;
            }
        }

        return null;
    }

    private static int IndexOf(IReadOnlyList<string> parts, string? name)
    {
        if (name is null)
        {
            return -1;
        }

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
