using System.Globalization;
using System.Net;
using System.Text.Json;

namespace Partwise.Api.Tests.Support;

/// <summary>
/// Small invented baselines whose distances can be computed by hand: three parts a, b, c and eight reference rows,
/// so p = 2 coordinates and the chi-square distribution with 2 degrees of freedom has closed forms
/// (F(x) = 1 − e^(−x/2), quantile −2 ln(1 − q)).
/// </summary>
public static class BaselineBodies
{
    /// <summary>The parts.</summary>
    public static readonly string[] Parts = ["a", "b", "c"];

    /// <summary>The reference rows (invented).</summary>
    public static readonly double[][] Rows =
    [
        [1.0, 2.0, 4.0], [2.0, 2.1, 3.0], [3.0, 1.2, 2.2], [2.2, 3.0, 2.0],
        [1.1, 1.0, 1.5], [4.0, 2.2, 3.1], [2.5, 2.6, 2.4], [1.8, 1.4, 3.3],
    ];

    /// <summary>A baseline request over <see cref="Rows"/> with extra members (without braces, or empty).</summary>
    public static string Request(string name = "tiny", string options = "\"scatter\": \"classical\"")
    {
        var rows = string.Join(", ", Rows.Select(r => "[" + string.Join(", ", r.Select(v => v.ToString("R", CultureInfo.InvariantCulture))) + "]"));
        return "{\"name\": \"" + name + "\", \"parts\": [\"a\", \"b\", \"c\"], \"rows\": [" + rows + "]" + (options.Length == 0 ? "" : ", " + options) + "}";
    }

    /// <summary>A sample S with the given values of a, b and c.</summary>
    public static string Sample(string id, double a, double b, double c) =>
        string.Create(CultureInfo.InvariantCulture, $"{{\"id\": \"{id}\", \"values\": {{\"a\": {a:R}, \"b\": {b:R}, \"c\": {c:R}}}, \"observedAt\": \"2026-05-11T09:40:00Z\", \"source\": \"test-lab\"}}");

    /// <summary>Creates a baseline and returns its document.</summary>
    public static async Task<JsonElement> Create(HttpClient client, string body)
    {
        using var response = await client.PostJson("/v1/baselines", body);
        var text = await response.Content.ReadAsStringAsync();
        Assert.True(response.StatusCode == HttpStatusCode.Created, $"expected 201, got {(int)response.StatusCode}: {text}");
        return JsonDocument.Parse(text).RootElement.Clone();
    }

    /// <summary>Screens a body against a stored baseline and returns the response's root (asserting 200).</summary>
    public static async Task<JsonElement> Screen(HttpClient client, string id, string body)
    {
        using var response = await client.PostJson($"/v1/baselines/{id}/screenings", body);
        return await response.OkJson();
    }

    /// <summary>
    /// d² of a sample by hand, in alr coordinates y = (ln(a/c), ln(b/c)) with the classical mean and covariance
    /// (divisor n − 1) of the reference rows and the explicit 2 × 2 inverse. The Mahalanobis distance does not depend on
    /// the choice of full-rank log-ratio coordinates (Filzmoser &amp; Hron 2008, Math. Geosci. 40:233-248), so this
    /// must equal the service's ilr distance.
    /// </summary>
    public static double HandSquaredDistance(double a, double b, double c)
    {
        var y = Rows.Select(r => (Math.Log(r[0] / r[2]), Math.Log(r[1] / r[2]))).ToArray();
        var n = y.Length;
        var m1 = y.Average(v => v.Item1);
        var m2 = y.Average(v => v.Item2);
        var s11 = y.Sum(v => (v.Item1 - m1) * (v.Item1 - m1)) / (n - 1);
        var s22 = y.Sum(v => (v.Item2 - m2) * (v.Item2 - m2)) / (n - 1);
        var s12 = y.Sum(v => (v.Item1 - m1) * (v.Item2 - m2)) / (n - 1);
        var det = (s11 * s22) - (s12 * s12);
        var d1 = Math.Log(a / c) - m1;
        var d2 = Math.Log(b / c) - m2;
        return ((s22 * d1 * d1) - (2 * s12 * d1 * d2) + (s11 * d2 * d2)) / det;
    }

    /// <summary>The mean and standard deviation (n − 1) of ln(x_i / x_j) over the reference rows.</summary>
    public static (double Mean, double Sd) LogRatioMoments(int i, int j)
    {
        var v = Rows.Select(r => Math.Log(r[i] / r[j])).ToArray();
        var mean = v.Average();
        return (mean, Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / (v.Length - 1)));
    }
}
