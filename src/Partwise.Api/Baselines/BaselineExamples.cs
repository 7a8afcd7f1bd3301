namespace Partwise.Api.Baselines;

/// <summary>
/// Example bodies for the baseline and screening routes: ten invented reference samples of one invented well
/// (mg/L), and a later sample of it with more sodium and chloride.
/// </summary>
public static class BaselineExamples
{
    private const string Rows =
        "[[40.0, 15.5, 145.1, 18.0], [37.9, 13.3, 151.1, 23.5], [37.7, 13.9, 159.1, 20.9], [40.5, 13.4, 149.5, 21.7], " +
        "[34.0, 14.2, 119.4, 17.1], [32.1, 14.6, 128.8, 20.7], [40.8, 14.7, 110.9, 18.7], [39.8, 15.2, 124.8, 18.9], " +
        "[35.6, 13.6, 170.4, 18.2], [39.8, 16.7, 139.9, 19.7]]";

    /// <summary>A baseline request in JSON.</summary>
    public const string Baseline =
        "{\"name\": \"well-04 reference\", \"description\": \"Invented example: ten samples of one well.\", " +
        "\"parts\": [\"Ca\", \"Na\", \"HCO3\", \"Cl\"], \"rows\": " + Rows + ", " +
        "\"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": 0.5}, \"coordinates\": {\"type\": \"ilr\"}, " +
        "\"scatter\": \"classical\", \"cutoff\": 0.975, \"rules\": [{\"ratio\": {\"num\": [\"Cl\"], \"den\": [\"HCO3\"]}, \"max\": 0.5}]}";

    /// <summary>The same reference samples as CSV.</summary>
    public const string BaselineCsv =
        "Ca,Na,HCO3,Cl\n40.0,15.5,145.1,18.0\n37.9,13.3,151.1,23.5\n37.7,13.9,159.1,20.9\n40.5,13.4,149.5,21.7\n" +
        "34.0,14.2,119.4,17.1\n32.1,14.6,128.8,20.7\n40.8,14.7,110.9,18.7\n39.8,15.2,124.8,18.9\n35.6,13.6,170.4,18.2\n" +
        "39.8,16.7,139.9,19.7\n";

    /// <summary>A later sample of the well, with more sodium and chloride.</summary>
    public const string Sample =
        "{\"id\": \"well-04/2026-05-11\", \"values\": {\"Ca\": 38.2, \"Na\": 31.5, \"HCO3\": 141.0, \"Cl\": 44.9}, " +
        "\"observedAt\": \"2026-05-11T09:40:00Z\", \"source\": \"field-lab\"}";

    /// <summary>A stored screening request.</summary>
    public const string Screening = "{\"sample\": " + Sample + "}";

    /// <summary>A flag review.</summary>
    public const string Review = "{\"status\": \"confirmed\", \"note\": \"Na/Cl rise seen in two more samples; resampling asked.\", \"reviewer\": \"analyst-2\"}";
}
