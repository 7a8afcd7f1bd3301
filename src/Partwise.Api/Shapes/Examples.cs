namespace Partwise.Api.Shapes;

/// <summary>
/// Example bodies for the OpenAPI document: invented samples from two wells of an invented groundwater monitoring
/// network (major ions in mg/L, one nitrate value below its detection limit).
/// </summary>
public static class Examples
{
    /// <summary>The table fields of a JSON example, without the closing brace, so options can follow.</summary>
    public const string TableFields =
        "\"parts\": [\"Ca\", \"Mg\", \"Na\", \"K\", \"HCO3\", \"Cl\", \"SO4\", \"NO3\"], " +
        "\"rows\": [[31.9, 8.1, 12.4, 1.7, 141.0, 17.9, 22.6, 3.1], [28.4, 7.6, 11.8, 1.5, 133.2, 16.1, 20.9, 0], [44.7, 12.9, 61.3, 3.0, 150.8, 98.4, 35.2, 2.2]], " +
        "\"ids\": [\"well-07/2026-03-02\", \"well-07/2026-04-06\", \"well-12/2026-04-06\"]";

    /// <summary>The zero policy of the JSON examples: the one zero is a nitrate below 0.05 mg/L.</summary>
    public const string Zeros = "\"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": {\"NO3\": 0.05}, \"fraction\": 0.65}";

    /// <summary>The same table as CSV.</summary>
    public const string Csv =
        "id,Ca,Mg,Na,K,HCO3,Cl,SO4,NO3\n" +
        "well-07/2026-03-02,31.9,8.1,12.4,1.7,141.0,17.9,22.6,3.1\n" +
        "well-07/2026-04-06,28.4,7.6,11.8,1.5,133.2,16.1,20.9,0\n" +
        "well-12/2026-04-06,44.7,12.9,61.3,3.0,150.8,98.4,35.2,2.2\n";

    /// <summary>A JSON request: the table, the zero policy, then <paramref name="options"/> (members without braces, or empty).</summary>
    public static string Json(string options = "") =>
        "{" + TableFields + ", " + Zeros + (options.Length == 0 ? "" : ", " + options) + "}";
}
