using System.Globalization;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Screening;
using Partwise.Core.Zeros;

namespace Partwise.Api.Baselines;

/// <summary>What screening needs of a baseline document: the math library's baseline and the zero policy.</summary>
/// <param name="Baseline">Location, scatter, threshold, rules and named ratios.</param>
/// <param name="Zeros">The zero policy applied to each screened sample.</param>
public sealed record ScreeningBaseline(Baseline Baseline, ZeroPolicy Zeros);

/// <summary>
/// Rebuilds a screening baseline from its document (<see cref="Baseline.Create"/>), checking every field, so that a
/// document posted inline screens exactly as the stored one does. Problems point into the document under a prefix
/// (<c>/baseline</c> for an inline document).
/// </summary>
public static class BaselineReading
{
    // The threshold and degrees of freedom are derived; a document that states others was altered or is not ours.
    private const double ThresholdTolerance = 1e-9;

    /// <summary>The screening baseline of <paramref name="document"/>.</summary>
    /// <exception cref="CompositionException">A missing (400) or unusable (422) field, at <c>{prefix}/field</c>.</exception>
    public static ScreeningBaseline Rebuild(BaselineDocument? document, string prefix)
    {
        ArgumentNullException.ThrowIfNull(prefix);
        if (document is null)
        {
            throw Missing(prefix, "The request needs \"baseline\": a baseline document as GET /v1/baselines/{id} returns it.");
        }

        try
        {
            return RebuildAt(document, prefix);
        }
        catch (CompositionException e) when (prefix.Length > 0)
        {
            throw BaselineOptionsReader.Rebase(e, pointer => pointer.StartsWith(prefix, StringComparison.Ordinal) ? pointer : prefix + pointer);
        }
    }

    private static ScreeningBaseline RebuildAt(BaselineDocument document, string prefix)
    {
        var parts = document.Parts ?? throw Missing(prefix + "/parts", "The baseline needs \"parts\".");
        var partTable = PartNames.Require(parts);
        var j = parts.Count;
        var zeros = ZerosOption.ToPolicy(document.Zeros, prefix + "/zeros");
        var type = document.Coordinates?.Type ?? throw Missing(prefix + "/coordinates/type", "The baseline needs \"coordinates\": {\"type\": ...}.");
        double[] map;
        switch (type)
        {
            case "ilr":
                map = Basis(document, j, prefix);
                break;
            case "ratios":
            case "selection":
                if (document.Ratios is not { Count: > 0 } ratios)
                {
                    throw Missing(prefix + "/ratios", $"A baseline in {type} coordinates needs \"ratios\".");
                }

                if (ratios.Count > j - 1)
                {
                    throw new CompositionException(ProblemTypes.SingularRatioSet, prefix + "/ratios", $"{ratios.Count} ratios over {j} parts cannot be independent.");
                }

                map = BaselineFitting.RatioMap(
                    [.. ratios.Select((r, k) => BaselineOptionsReader.CoordinateRatio(r, partTable.Parts, string.Create(CultureInfo.InvariantCulture, $"{prefix}/ratios/{k}")))],
                    j);
                break;
            default:
                throw new CompositionException(ProblemTypes.InvalidInput, prefix + "/coordinates/type", $"The coordinates type '{type}' is unknown; use ilr, ratios or selection.");
        }

        var p = map.Length / j;
        var location = document.Location ?? throw Missing(prefix + "/location", "The baseline needs \"location\".");
        if (location.Count != p)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, prefix + "/location", string.Create(CultureInfo.InvariantCulture, $"The location has {location.Count} values; the coordinates have {p}."));
        }

        var covariance = document.Covariance ?? throw Missing(prefix + "/covariance", "The baseline needs \"covariance\".");
        if (covariance.ColumnCount != p || covariance.RowCount != p)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, prefix + "/covariance", string.Create(CultureInfo.InvariantCulture, $"The covariance must be {p} × {p}."));
        }

        var scatter = BaselineOptionsReader.Scatter(document.Scatter, prefix + "/scatter", required: true);
        var cutoff = document.Cutoff ?? throw Missing(prefix + "/cutoff", "The baseline needs \"cutoff\".");
        var rules = BaselineOptionsReader.Rules(document.Rules, parts, prefix + "/rules");
        var named = NamedRatios(document, parts, prefix);

        Baseline baseline;
        try
        {
            baseline = Baseline.Create(parts, map, location, covariance.Values, scatter, cutoff, named, rules);
        }
        catch (CompositionException e)
        {
            throw BaselineOptionsReader.Rebase(e, pointer => pointer == "/ratios" && type == "ilr" ? prefix + "/basis" : prefix + pointer);
        }

        if (document.DegreesOfFreedom is { } dof && dof != baseline.DegreesOfFreedom)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, prefix + "/degreesOfFreedom", string.Create(CultureInfo.InvariantCulture, $"The baseline has {baseline.DegreesOfFreedom} coordinates, so {baseline.DegreesOfFreedom} degrees of freedom, not {dof}."));
        }

        if (document.Threshold is { } threshold && !(Math.Abs(threshold - baseline.Threshold) <= ThresholdTolerance * Math.Max(1, baseline.Threshold)))
        {
            throw new CompositionException(ProblemTypes.InvalidInput, prefix + "/threshold", string.Create(CultureInfo.InvariantCulture, $"The threshold must be χ²_p(cutoff) = {baseline.Threshold:R} for this cutoff and p; the document says {threshold:R}."));
        }

        return new ScreeningBaseline(baseline, zeros);
    }

    private static double[] Basis(BaselineDocument document, int j, string prefix)
    {
        var basis = document.Basis ?? throw Missing(prefix + "/basis", "A baseline in ilr coordinates needs \"basis\": J rows of J − 1 coefficients.");
        if (basis.RowCount != j || basis.ColumnCount != j - 1)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, prefix + "/basis", string.Create(CultureInfo.InvariantCulture, $"The basis must have {j} rows (one per part) of {j - 1} coefficients."));
        }

        var p = j - 1;
        for (var c = 0; c < p; c++)
        {
            double sum = 0, size = 0;
            for (var r = 0; r < j; r++)
            {
                sum += basis.Values[(r * p) + c];
                size += Math.Abs(basis.Values[(r * p) + c]);
            }

            // Each column must be a log-contrast (sum 0), or the coordinate would depend on the sample's units.
            if (size == 0 || Math.Abs(sum) > 1e-9 * size)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, string.Create(CultureInfo.InvariantCulture, $"{prefix}/basis"), string.Create(CultureInfo.InvariantCulture, $"Column {c} of the basis does not sum to 0 (it is not a log-contrast)."));
            }
        }

        return basis.Values;
    }

    private static RatioBaseline[] NamedRatios(BaselineDocument document, IReadOnlyList<string> parts, string prefix)
    {
        if (document.NamedRatios is not { Count: > 0 } items)
        {
            return [];
        }

        var amalgamations = BaselineOptionsReader.Amalgamations(document.Amalgamations, parts, prefix + "/amalgamations");
        var result = new RatioBaseline[items.Count];
        for (var k = 0; k < items.Count; k++)
        {
            var at = string.Create(CultureInfo.InvariantCulture, $"{prefix}/namedRatios/{k}");
            var item = items[k] ?? throw Missing(at, "A named ratio must be an object.");
            var num = Amalgamation(amalgamations, item.Num, at + "/num");
            var den = Amalgamation(amalgamations, item.Den, at + "/den");
            var ratio = BaselineOptionsReader.NamedRatio(parts, item.Num!, num, item.Den!, den, at);
            var location = item.Location ?? throw Missing(at + "/location", "A named ratio needs \"location\".");
            var scale = item.Scale ?? throw Missing(at + "/scale", "A named ratio needs \"scale\".");
            result[k] = new RatioBaseline(ratio, location, scale);
        }

        return result;
    }

    private static int[] Amalgamation(Dictionary<string, int[]> amalgamations, string? name, string pointer)
    {
        if (name is null)
        {
            throw Missing(pointer, "A named ratio names its amalgamations in \"num\" and \"den\".");
        }

        return amalgamations.TryGetValue(name, out var parts)
            ? parts
            : throw new CompositionException(ProblemTypes.UnknownPart, pointer, $"The baseline has no amalgamation named '{name}' in \"amalgamations\".");
    }

    private static CompositionException Missing(string pointer, string detail) => new(ProblemTypes.InvalidInput, pointer, detail);
}
