using System.Text.Json;
using Partwise.Storage.Baselines;
using Partwise.Storage.Screenings;

namespace Partwise.Storage.Tests.Support;

/// <summary>Invented samples of the demo groundwater network (wells, major ions in mg/L) and their screening entries.</summary>
public static class Samples
{
    /// <summary>A baseline document in the shape the host renders, built from the store's stamp.</summary>
    public static string Document(BaselineStamp stamp) => JsonSerializer.Serialize(new
    {
        id = stamp.Id,
        name = stamp.Name,
        version = stamp.Version,
        createdAt = stamp.CreatedAt,
        parts = new[] { "Ca", "Mg", "Na", "Cl" },
        scatter = "robust",
    });

    /// <summary>The ion values of one sample; <paramref name="sodium"/> varies them.</summary>
    public static Dictionary<string, double> Values(double sodium = 12.4) =>
        new(StringComparer.Ordinal) { ["Ca"] = 31.9, ["Mg"] = 8.1, ["Na"] = sodium, ["Cl"] = 17.9 };

    /// <summary>A screening entry for <paramref name="sampleId"/>, flagged or not.</summary>
    public static ScreeningEntry Entry(string sampleId, double sodium = 12.4, bool flagged = false, string? source = "well-07")
    {
        var values = Values(sodium);
        var distance = flagged ? 5.1 : 1.2;
        var result = JsonSerializer.Serialize(new { sampleId, distance, pValue = flagged ? 0.002 : 0.6, flagged });
        return new ScreeningEntry(
            sampleId,
            SampleFingerprint.Compute(values),
            result,
            new DateTimeOffset(2026, 3, 2, 9, 30, 0, TimeSpan.FromHours(1)),
            source,
            flagged ? new ScreeningFlag(distance, 0.002, """[{"label":"Na/Cl","value":1.9,"z":3.4,"expected":[0.5,0.9]}]""", JsonSerializer.Serialize(values)) : null);
    }
}
