using System.Globalization;
using System.Text;

namespace Partwise.Demo;

/// <summary>
/// The demo request bodies and CSV files built from the invented groundwater scenario, and
/// <see cref="WriteAll"/> to regenerate the committed <c>demo/</c> folder.
/// </summary>
public static class DemoFiles
{
    private const string JsonPost = "curl -s -H 'Content-Type: application/json' --data-binary @demo/";
    private const string CsvPost = "curl -s -H 'Content-Type: text/csv' --data-binary @demo/";

    /// <summary>The sample source named in screening bodies.</summary>
    public const string Source = "demo-lab";

    /// <summary>The invented instrument named in the instrument export.</summary>
    public const string Instrument = "demo-ic-01";

    /// <summary>
    /// Writes every demo file of the scenario with seed <see cref="GroundwaterScenario.DemoSeed"/> into
    /// <paramref name="directory"/> (created if missing), UTF-8 without a byte-order mark; returns the paths written.
    /// </summary>
    public static IReadOnlyList<string> WriteAll(string directory)
    {
        ArgumentException.ThrowIfNullOrEmpty(directory);
        Directory.CreateDirectory(directory);
        var paths = new List<string>();
        foreach (var file in Build(GroundwaterScenario.Create(GroundwaterScenario.DemoSeed)))
        {
            var path = Path.Combine(directory, file.Name);
            File.WriteAllText(path, file.Content, new UTF8Encoding(false));
            paths.Add(path);
        }

        return paths;
    }

    /// <summary>Every demo file of <paramref name="scenario"/>, README last.</summary>
    public static IReadOnlyList<DemoFile> Build(GroundwaterScenario scenario)
    {
        ArgumentNullException.ThrowIfNull(scenario);
        var baseline = scenario.Baseline;
        var drift = scenario.OfWell(GroundwaterScenario.DriftingWell, MonitoringPeriod.Later);
        var wellBaseline = scenario.OfWell(GroundwaterScenario.DriftingWell, MonitoringPeriod.Baseline);
        var files = new List<DemoFile>
        {
            new(
                "wells-baseline.json",
                $"The 2025 samples of all {GroundwaterScenario.Wells.Count} wells ({baseline.Count} rows) as a Table body with multiplicative replacement of the values below detection.",
                $"{JsonPost}wells-baseline.json \"$PARTWISE_URL/v1/summary\"   (also /v1/compositions/prepare, /v1/distances, /v1/lra, /v1/ratio-selection)",
                TableJson(baseline)),
            new(
                "wells-baseline.csv",
                "The same 2025 samples as CSV (id column first).",
                $"{CsvPost}wells-baseline.csv \"$PARTWISE_URL/v1/coordinates?transform=clr&zeros=multiplicative&detectionLimit=0.05\" -H 'Accept: text/csv'",
                TableCsv(baseline)),
            new(
                "well-11-drift.json",
                $"The January–June 2026 samples of {GroundwaterScenario.DriftingWell} ({drift.Count} rows), mixing ever more with the brine end-member.",
                $"{JsonPost}well-11-drift.json \"$PARTWISE_URL/v1/compositions/prepare\"",
                TableJson(drift)),
            new(
                "well-11-drift.csv",
                $"The same {GroundwaterScenario.DriftingWell} samples of 2026 as CSV.",
                $"{CsvPost}well-11-drift.csv \"$PARTWISE_URL/v1/compositions/prepare?zeros=multiplicative&detectionLimit=0.05&total=100\" -H 'Accept: text/csv'",
                TableCsv(drift)),
            new(
                "coordinates-ilr.json",
                "The 2025 samples with the default ilr (pivot) transform.",
                $"{JsonPost}coordinates-ilr.json \"$PARTWISE_URL/v1/coordinates\"",
                TableJson(baseline, [("transform", DemoJson.Map(("type", DemoJson.Of("ilr"))))])),
            new(
                "coordinates-ratios.json",
                "The 2025 samples in a set of ratios an analyst reads: pairwise, an amalgamation and a balance.",
                $"{JsonPost}coordinates-ratios.json \"$PARTWISE_URL/v1/coordinates\"",
                TableJson(baseline, [("transform", RatiosTransform())])),
            new(
                "well-11-drift-ratios.json",
                $"The 2026 samples of {GroundwaterScenario.DriftingWell} in ln(Na/Ca) and ln(Cl/HCO3), the two ratios the brine raises.",
                $"{JsonPost}well-11-drift-ratios.json \"$PARTWISE_URL/v1/coordinates\"",
                TableJson(drift, [("transform", DemoJson.Map(
                    ("type", DemoJson.Of("ratios")),
                    ("ratios", DemoJson.List([Pairwise("Na", "Ca"), Pairwise("Cl", "HCO3")]))))])),
            new(
                "ratio-selection.json",
                "The 2025 samples for stepwise ratio selection with two named amalgamations (hardness, alkalis).",
                $"{JsonPost}ratio-selection.json \"$PARTWISE_URL/v1/ratio-selection\"",
                TableJson(
                    baseline,
                    [
                        ("amalgamations", DemoJson.Map(
                            ("hardness", DemoJson.List(["Ca", "Mg"])),
                            ("alkalis", DemoJson.List(["Na", "K"])))),
                        ("stop", DemoJson.Map(("maxRatios", DemoJson.Of(7)), ("explained", DemoJson.Of(0.99)))),
                    ])),
            new(
                "lra.json",
                "The 2025 samples for log-ratio analysis with mean part weights, two dimensions.",
                $"{JsonPost}lra.json \"$PARTWISE_URL/v1/lra\"   (add -H 'Accept: image/svg+xml' for the biplot)",
                TableJson(baseline, [("weights", DemoJson.Of("mean")), ("dimensions", DemoJson.Of(2))])),
            new(
                "well-11-baseline.json",
                $"A baseline of {GroundwaterScenario.DriftingWell}'s own 2025 samples ({wellBaseline.Count} rows): ilr coordinates, robust scatter, and one invented site rule on Cl/HCO3.",
                $"{JsonPost}well-11-baseline.json -H \"Authorization: Bearer $PARTWISE_KEY\" \"$PARTWISE_URL/v1/baselines\"",
                BaselineJson(wellBaseline)),
            new(
                "well-11-screenings.json",
                $"The 2026 samples of {GroundwaterScenario.DriftingWell} as a screening body; the later ones should stand out.",
                $"{JsonPost}well-11-screenings.json -H \"Authorization: Bearer $PARTWISE_KEY\" \"$PARTWISE_URL/v1/baselines/$BASELINE_ID/screenings\"",
                ScreeningsJson(drift)),
            new(
                "well-11-instrument.csv",
                $"The 2026 samples of {GroundwaterScenario.DriftingWell} as an instrument exports them, in time order: sample id, time taken (UTC), instrument, then mg/L, `<limit` below detection. The feed example posts them one by one as they arrive.",
                $"/usr/bin/python3 src/clients/python/examples/instrument_feed.py demo/well-11-instrument.csv --url \"$PARTWISE_URL\"",
                InstrumentCsv(drift)),
        };
        files.Add(new DemoFile("README.md", "What these files are and how to regenerate them.", null, Readme(scenario, files)));
        return files;
    }

    /// <summary>
    /// A Table body (<c>parts</c>, <c>rows</c>, <c>ids</c>) of <paramref name="samples"/> with the demo zero policy
    /// (multiplicative replacement at 0.65 of each part's detection limit).
    /// </summary>
    public static string TableJson(IReadOnlyList<WaterSample> samples)
    {
        ArgumentNullException.ThrowIfNull(samples);
        return TableJson(samples, []);
    }

    /// <summary>The samples as CSV: a header <c>id,Ca,...,NO3</c>, then one line per sample, LF line endings.</summary>
    public static string TableCsv(IReadOnlyList<WaterSample> samples)
    {
        ArgumentNullException.ThrowIfNull(samples);
        var sb = new StringBuilder();
        sb.Append("id,").AppendJoin(',', GroundwaterScenario.Parts).Append('\n');
        foreach (var s in samples)
        {
            sb.Append(s.Id).Append(',').AppendJoin(',', s.Values.Select(DemoJson.FormatNumber)).Append('\n');
        }

        return sb.ToString();
    }

    /// <summary>
    /// The samples as an instrument's export: a header <c>sample,taken_at,instrument,Ca,...,NO3</c>, then one line per
    /// sample in time order, the time in ISO 8601 UTC, and a value below its part's detection limit written as
    /// <c>&lt;limit</c> (for example <c>&lt;0.05</c>), as laboratory instruments report it; LF line endings.
    /// </summary>
    public static string InstrumentCsv(IReadOnlyList<WaterSample> samples)
    {
        ArgumentNullException.ThrowIfNull(samples);
        var sb = new StringBuilder();
        sb.Append("sample,taken_at,instrument,").AppendJoin(',', GroundwaterScenario.Parts).Append('\n');
        foreach (var s in samples.OrderBy(s => s.ObservedAt))
        {
            sb.Append(s.Id).Append(',')
                .Append(s.ObservedAt.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture)).Append(',')
                .Append(Instrument).Append(',')
                .AppendJoin(',', GroundwaterScenario.Parts.Select((p, j) => s.Values[j] == 0
                    ? "<" + DemoJson.FormatNumber(GroundwaterScenario.DetectionLimits[p])
                    : DemoJson.FormatNumber(s.Values[j])))
                .Append('\n');
        }

        return sb.ToString();
    }

    /// <summary>
    /// A screening body <c>{ "samples": [{ "id", "values": { part: value }, "observedAt", "source" }] }</c>.
    /// </summary>
    public static string ScreeningsJson(IReadOnlyList<WaterSample> samples)
    {
        ArgumentNullException.ThrowIfNull(samples);
        return DemoJson.Map(("samples", DemoJson.List(samples.Select(s => DemoJson.Map(
            ("id", DemoJson.Of(s.Id)),
            ("values", DemoJson.Map([.. GroundwaterScenario.Parts.Select((p, j) => (p, DemoJson.Of(s.Values[j])))])),
            ("observedAt", DemoJson.Of(s.ObservedAt.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture))),
            ("source", DemoJson.Of(Source))))))).Render();
    }

    /// <summary>
    /// The zero policy of the demo bodies: multiplicative replacement at 0.65 of each part's detection limit
    /// (<see cref="GroundwaterScenario.DetectionLimits"/>; Martín-Fernández et al. 2003, 0.65 being common practice).
    /// </summary>
    internal static DemoJson ZeroPolicy() => DemoJson.Map(
        ("method", DemoJson.Of("multiplicative")),
        ("detectionLimits", DemoJson.Map([.. GroundwaterScenario.Parts.Select(p => (p, DemoJson.Of(GroundwaterScenario.DetectionLimits[p])))])),
        ("fraction", DemoJson.Of(0.65)));

    private static string TableJson(IReadOnlyList<WaterSample> samples, (string Key, DemoJson Value)[] options)
    {
        var members = new List<(string, DemoJson)>
        {
            ("parts", DemoJson.List(GroundwaterScenario.Parts)),
            ("rows", DemoJson.List(samples.Select(s => DemoJson.List(s.Values)))),
            ("ids", DemoJson.List(samples.Select(s => s.Id))),
            ("zeros", ZeroPolicy()),
        };
        members.AddRange(options);
        return DemoJson.Map([.. members]).Render();
    }

    private static string BaselineJson(IReadOnlyList<WaterSample> samples) => TableJson(
        samples,
        [
            ("name", DemoJson.Of($"{GroundwaterScenario.DriftingWell} 2025")),
            ("description", DemoJson.Of($"Invented demo data: the 2025 weekly samples of {GroundwaterScenario.DriftingWell} as the reference for its later samples.")),
            ("coordinates", DemoJson.Map(("type", DemoJson.Of("ilr")))),
            ("scatter", DemoJson.Of("robust")),
            ("cutoff", DemoJson.Of(0.975)),
            ("rules", DemoJson.List([DemoJson.Map(("ratio", Pairwise("Cl", "HCO3")), ("max", DemoJson.Of(0.5)))])),
        ]);

    private static DemoJson RatiosTransform() => DemoJson.Map(
        ("type", DemoJson.Of("ratios")),
        ("ratios", DemoJson.List(
        [
            Pairwise("Na", "Cl"),
            Pairwise("Na", "Ca"),
            Pairwise("Cl", "HCO3"),
            Pairwise("NO3", "Cl"),
            DemoJson.Map(("num", DemoJson.List(["Ca", "Mg"])), ("den", DemoJson.List(["Na", "K"])), ("kind", DemoJson.Of("amalgamation"))),
            DemoJson.Map(("num", DemoJson.List(["Ca", "Mg"])), ("den", DemoJson.List(["HCO3", "SO4"])), ("kind", DemoJson.Of("balance"))),
        ])));

    private static DemoJson Pairwise(string num, string den) =>
        DemoJson.Map(("num", DemoJson.List([num])), ("den", DemoJson.List([den])));

    private static string Readme(GroundwaterScenario scenario, IReadOnlyList<DemoFile> files)
    {
        var sb = new StringBuilder();
        sb.Append("# Demo data: an invented groundwater monitoring network\n\n");
        sb.Append("Every number here is invented, generated by `Partwise.Demo.GroundwaterScenario.Create(")
            .Append(scenario.Seed.ToString(CultureInfo.InvariantCulture))
            .Append(")`; none comes from a real network. Do not edit these files by hand: regenerate them with\n")
            .Append("`Partwise.Demo.DemoFiles.WriteAll(\"demo\")`. A test in Partwise.Core.Tests regenerates them and fails when they differ.\n\n");
        sb.Append("## Scenario\n\n");
        sb.Append("- Parts: ").AppendJoin(", ", GroundwaterScenario.Parts).Append(", all in mg/L.\n");
        sb.Append("- Wells: ").AppendJoin(", ", GroundwaterScenario.Wells.Select(w => $"{w.Id} ({w.Cadence.ToString().ToLowerInvariant()})")).Append(".\n");
        sb.Append("- Baseline: 2025, ").Append(scenario.Baseline.Count.ToString(CultureInfo.InvariantCulture))
            .Append(" samples. Later: January–June 2026, ").Append(scenario.Later.Count.ToString(CultureInfo.InvariantCulture)).Append(" samples.\n");
        sb.Append("- Variation: multivariate log-normal around each well's own mean composition, with a carbonate factor ")
            .Append("(Ca, Mg, HCO3, SO4) and a salinity factor (Na, Cl, K, SO4), so Ca–HCO3 and Na–Cl are strongly correlated.\n");
        sb.Append("- Drift: from 2026-01-01 ").Append(GroundwaterScenario.DriftingWell).Append(" mixes with an invented brine (mg/L: ")
            .AppendJoin(", ", GroundwaterScenario.Parts.Select((p, j) => $"{p} {DemoJson.FormatNumber(GroundwaterScenario.Brine[j])}"))
            .Append("), its fraction rising linearly to ").Append(DemoJson.FormatNumber(GroundwaterScenario.MaxBrineFraction))
            .Append(" on 2026-06-30: Na/Ca and Cl/HCO3 rise.\n");
        sb.Append("- Detection limits (mg/L); a value below its limit is reported as 0: ")
            .AppendJoin(", ", GroundwaterScenario.Parts.Select(p => $"{p} {DemoJson.FormatNumber(GroundwaterScenario.DetectionLimits[p])}"))
            .Append(". Zeros in the baseline: ");
        var zeros = GroundwaterScenario.Parts.Select((p, j) => (p, n: scenario.Baseline.Count(s => s.Values[j] == 0))).Where(t => t.n > 0).ToArray();
        sb.AppendJoin(", ", zeros.Select(t => $"{t.p} {t.n.ToString(CultureInfo.InvariantCulture)}")).Append(".\n");
        sb.Append("- Values are rounded to two decimals. The JSON bodies replace zeros multiplicatively at 0.65 of each part's limit;\n")
            .Append("  CSV takes one limit for all parts as a query parameter (`detectionLimit=0.05` is the smallest, NO3's).\n\n");
        sb.Append("## Files\n\n");
        foreach (var f in files)
        {
            sb.Append("- `").Append(f.Name).Append("`: ").Append(f.Purpose).Append('\n');
            if (f.Usage is not null)
            {
                sb.Append("  `").Append(f.Usage).Append("`\n");
            }
        }

        sb.Append('\n');
        sb.Append("Set `PARTWISE_URL` (for example http://127.0.0.1:5080) and run the commands from the repository root.\n");
        return sb.ToString();
    }
}
