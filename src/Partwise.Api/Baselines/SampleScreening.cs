using System.Globalization;
using Partwise.Core.Problems;
using Partwise.Core.Screening;
using Partwise.Core.Tables;
using Partwise.Core.Zeros;

namespace Partwise.Api.Baselines;

/// <summary>A sample read from a request, checked, with its place in the request for problems.</summary>
/// <param name="Item">The sample as sent.</param>
/// <param name="Pointer">Its JSON pointer: <c>/sample</c> or <c>/samples/i</c>.</param>
public sealed record PlacedSample(SampleItem Item, string Pointer);

/// <summary>
/// Screens samples against a baseline: checks each sample's id and values (parts matched by name), applies the
/// baseline's zero policy to each sample on its own, then the math library's screening.
/// </summary>
public static class SampleScreening
{
    /// <summary>The longest sample id and source.</summary>
    public const int MaxTextLength = 200;

    private const int MaxListedProblems = 20;

    /// <summary>The samples of a request with <c>sample</c> or <c>samples</c>, with their pointers.</summary>
    /// <exception cref="CompositionException">400 for neither or both, an empty list, a null sample; 413 over <paramref name="maxSamples"/>.</exception>
    public static PlacedSample[] Place(SampleItem? sample, IReadOnlyList<SampleItem>? samples, int maxSamples)
    {
        if (sample is not null && samples is not null)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/samples", "Send either \"sample\" (one) or \"samples\" (a list), not both.");
        }

        if (sample is not null)
        {
            return [new PlacedSample(sample, "/sample")];
        }

        if (samples is null)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "", "The request needs \"sample\" (one sample) or \"samples\" (a list of samples).");
        }

        if (samples.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/samples", "\"samples\" needs at least one sample.");
        }

        if (samples.Count > maxSamples)
        {
            throw new CompositionException(ProblemTypes.TooLarge, "/samples", string.Create(CultureInfo.InvariantCulture, $"The request has {samples.Count} samples; at most {maxSamples} are screened in one request."));
        }

        return [.. samples.Select((s, i) => new PlacedSample(
            s ?? throw new CompositionException(ProblemTypes.InvalidInput, string.Create(CultureInfo.InvariantCulture, $"/samples/{i}"), "A sample must be an object, not null."),
            string.Create(CultureInfo.InvariantCulture, $"/samples/{i}")))];
    }

    /// <summary>
    /// The screening of every sample, in order: all-or-nothing (a problem in any sample refuses the request, listing
    /// up to 20 problems). Zeros are replaced by the baseline's policy per sample (multiplicative replacement uses the
    /// sample's own sum); a zero under <c>reject</c> is a 422 at the value.
    /// </summary>
    /// <exception cref="CompositionException">400 for a missing id or values; 422 for a missing or unknown part, or a value that cannot be used.</exception>
    public static ScreeningResultItem[] Screen(ScreeningBaseline baseline, IReadOnlyList<PlacedSample> samples)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(samples);
        var core = baseline.Baseline;
        var parts = core.Parts;
        var j = parts.Count;
        var m = samples.Count;
        var rows = new double[m * j];
        var errors = new List<ProblemError>();
        string? type = null;
        for (var i = 0; i < m && errors.Count < MaxListedProblems; i++)
        {
            var (item, at) = (samples[i].Item, samples[i].Pointer);
            if (string.IsNullOrWhiteSpace(item.Id) || item.Id.Length > MaxTextLength)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, at + "/id", $"A sample needs \"id\": 1 to {MaxTextLength} characters, unique per baseline.");
            }

            if (item.Source is { Length: > MaxTextLength })
            {
                throw new CompositionException(ProblemTypes.InvalidInput, at + "/source", $"\"source\" has at most {MaxTextLength} characters.");
            }

            var values = item.Values ?? throw new CompositionException(ProblemTypes.InvalidInput, at + "/values", "A sample needs \"values\": an object from part name to value.");
            for (var k = 0; k < j; k++)
            {
                var pointer = $"{at}/values/{JsonPointer.Escape(parts[k])}";
                if (!values.TryGetValue(parts[k], out var v))
                {
                    Add(ProblemTypes.MissingPart, pointer, $"The sample has no value for the baseline's part '{parts[k]}'.");
                }
                else if (!double.IsFinite(v))
                {
                    Add(ProblemTypes.NonFiniteValue, pointer, "The value is not a finite number.");
                }
                else if (v < 0)
                {
                    Add(ProblemTypes.NegativeValue, pointer, string.Create(CultureInfo.InvariantCulture, $"The value {v:R} is negative; compositions are non-negative."));
                }
                else
                {
                    rows[(i * j) + k] = v;
                }
            }

            foreach (var name in values.Keys)
            {
                if (!parts.Contains(name))
                {
                    Add(ProblemTypes.UnknownPart, $"{at}/values/{JsonPointer.Escape(name)}", $"The baseline has no part named '{name}'.");
                }
            }
        }

        if (type is not null)
        {
            throw new CompositionException(type, string.Create(CultureInfo.InvariantCulture, $"{errors.Count} value(s) of the samples cannot be screened."), errors);
        }

        var table = CompositionTable.FromValues(parts, rows);
        ZeroResult replaced;
        try
        {
            replaced = ZeroReplacement.Apply(table, baseline.Zeros);
        }
        catch (CompositionException e)
        {
            // The Core points at /rows/i/j of the one table built here; the caller sent /samples/i/values/{part}.
            throw BaselineOptionsReader.Rebase(e, pointer => RowPointer(pointer, samples, parts));
        }

        ScreeningResult[] results;
        try
        {
            results = Screener.ScreenRows(core, replaced.Table.Values);
        }
        catch (CompositionException e)
        {
            throw BaselineOptionsReader.Rebase(e, pointer => RowPointer(pointer, samples, parts));
        }

        var imputed = replaced.Imputed.ToLookup(c => c.Row);
        var items = new ScreeningResultItem[m];
        for (var i = 0; i < m; i++)
        {
            var r = results[i];
            if (Unrepresentable(r) is { } label)
            {
                // Finite values can still give a ratio past the double range (44.9 / 1e-320); JSON has no number for it.
                Add(ProblemTypes.NonFiniteValue, samples[i].Pointer + "/values", $"The ratio {label} of these values is outside the range of a double (about 1e-308 to 1.8e308); the values cannot be screened as given.");
                continue;
            }

            items[i] = new ScreeningResultItem
            {
                SampleId = samples[i].Item.Id!,
                Distance = r.Distance,
                SquaredDistance = r.SquaredDistance,
                PValue = r.PValue,
                Flagged = r.Flagged,
                Reasons = [.. r.Reasons.Select(x => new ReasonItem(x.Label, x.Value, x.Z, [x.ExpectedLow, x.ExpectedHigh]))],
                RuleViolations = [.. r.RuleViolations.Select(x => new RuleViolationItem(x.Label, x.Value, x.Min, x.Max))],
                Imputed = [.. imputed[i].Select(c => new ImputedValueItem(c.Part, c.Value))],
            };
        }

        if (type is not null)
        {
            throw new CompositionException(type, string.Create(CultureInfo.InvariantCulture, $"{errors.Count} sample(s) cannot be screened."), errors);
        }

        return items;

        void Add(string problemType, string pointer, string detail)
        {
            if (errors.Count < MaxListedProblems)
            {
                type ??= problemType;
                errors.Add(new ProblemError(pointer, detail));
            }
        }
    }

    /// <summary>The label of the first ratio of the result that is not a finite number, or null when all are.</summary>
    private static string? Unrepresentable(ScreeningResult r)
    {
        if (!double.IsFinite(r.SquaredDistance))
        {
            return "distance";
        }

        foreach (var x in r.Reasons)
        {
            if (!double.IsFinite(x.Value) || !double.IsFinite(x.Z) || !double.IsFinite(x.ExpectedLow) || !double.IsFinite(x.ExpectedHigh))
            {
                return x.Label;
            }
        }

        foreach (var x in r.RuleViolations)
        {
            if (!double.IsFinite(x.Value))
            {
                return x.Label;
            }
        }

        return null;
    }

    private static string RowPointer(string pointer, IReadOnlyList<PlacedSample> samples, IReadOnlyList<string> parts)
    {
        var segments = pointer.Split('/');
        if (segments.Length == 4 && segments[1] == "rows"
            && int.TryParse(segments[2], NumberStyles.None, CultureInfo.InvariantCulture, out var i) && i < samples.Count
            && int.TryParse(segments[3], NumberStyles.None, CultureInfo.InvariantCulture, out var k) && k < parts.Count)
        {
            return $"{samples[i].Pointer}/values/{JsonPointer.Escape(parts[k])}";
        }

        if (segments.Length == 3 && segments[1] == "rows" && int.TryParse(segments[2], NumberStyles.None, CultureInfo.InvariantCulture, out var row) && row < samples.Count)
        {
            return samples[row].Pointer + "/values";
        }

        return pointer;
    }
}
