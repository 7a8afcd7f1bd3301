using System.Globalization;
using System.Xml.Linq;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Analysis;

public class LraTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/lra";
    private static readonly XNamespace Svg = "http://www.w3.org/2000/svg";
    private static readonly double L = Math.Log(2);

    [Fact]
    public async Task OneVaryingPartGivesOneDimensionComputedByHand()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 1, 1], [2, 1, 1], [4, 1, 1]], \"ids\": [\"r0\", \"r1\", \"r2\"], \"dimensions\": 1}");
        var body = await response.OkJson();

        // ln a = s ∈ {0, l, 2l}; centred clr rows (s − l)(2/3, −1/3, −1/3); TV = 4l²/27 = s₁², s₂ = 0 (Greenacre & Lewi 2009).
        Tolerance.Close([Math.Sqrt(4 * L * L / 27), 0], body.GetProperty("singularValues"), 1e-12, 1e-12);
        Tolerance.Close([1, 0], body.GetProperty("inertia"), 1e-12, 0);
        Tolerance.Close(4 * L * L / 27, body.GetProperty("totalVariance").GetDouble(), 1e-14, 1e-12);
        Assert.Equal("n", body.GetProperty("divisor").GetString());

        // Principal coordinates: ±l √(2/9) for the outer rows, 0 for the middle one; a (the largest |V|) is oriented
        // positive, so the row with the most a is positive. Standard coordinates V / √w: a → √2; contributions V² = (2/3, 1/6, 1/6).
        var principal = body.GetProperty("rows").GetProperty("principal");
        Tolerance.Close([[-L * Math.Sqrt(2) / 3], [0], [L * Math.Sqrt(2) / 3]], principal, 1e-12, 1e-12);
        Tolerance.Close([[Math.Sqrt(2)], [-Math.Sqrt(2) / 2], [-Math.Sqrt(2) / 2]], body.GetProperty("parts").GetProperty("standard"), 1e-12, 1e-12);
        Tolerance.Close([[2 / 3.0], [1 / 6.0], [1 / 6.0]], body.GetProperty("parts").GetProperty("contributions"), 1e-12, 1e-12);
        Assert.Equal(["r0", "r1", "r2"], body.GetProperty("rows").GetProperty("ids").EnumerateArray().Select(e => e.GetString()));
        Tolerance.Close([1 / 3.0, 1 / 3.0, 1 / 3.0], body.GetProperty("weights"), 1e-15, 0);
    }

    [Fact]
    public async Task InertiaSumsToTheSummarysTotalVariance()
    {
        var table = SeededTable.Fields(SeededTable.Values(31, 20, 6));
        using var client = factory.CreateClient();
        using var lra = await client.PostJson(Path, "{" + table + ", \"weights\": \"mean\"}");
        var body = await lra.OkJson();
        using var summary = await client.PostJson("/v1/summary", "{" + table + ", \"weights\": \"mean\"}");
        var s = await summary.OkJson();

        // Σ s_k² = TV (divisor n) = summary TV (divisor n − 1) × (n − 1) / n; the inertia fractions sum to 1.
        var values = body.GetProperty("singularValues").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        Assert.Equal(5, values.Length);
        Tolerance.Close(s.GetProperty("totalVariance").GetDouble() * 19 / 20, values.Sum(v => v * v), 1e-14, 1e-10);
        Tolerance.Close(1, body.GetProperty("inertia").EnumerateArray().Sum(v => v.GetDouble()), 1e-12, 0);
        Tolerance.Close(s.GetProperty("weights").EnumerateArray().Select(v => v.GetDouble()).ToArray(), body.GetProperty("weights"), 1e-15, 1e-12);
        Assert.Equal(2, body.GetProperty("rows").GetProperty("principal")[0].GetArrayLength());
    }

    [Fact]
    public async Task CsvTableWithQueryOptions()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?dimensions=1&weights=mean", WorkedExample.Csv);
        var body = await response.OkJson();
        Assert.Single(body.GetProperty("parts").GetProperty("standard")[0].EnumerateArray());
        Assert.Equal(["w1", "w2"], body.GetProperty("rows").GetProperty("ids").EnumerateArray().Select(e => e.GetString()));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(3)]
    public async Task DimensionsOutOfRangeAreA422(int dimensions)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + SeededTable.Fields(SeededTable.Values(32, 10, 3)) + ", \"dimensions\": " + dimensions.ToString(CultureInfo.InvariantCulture) + "}");
        await response.Problem(422, "/problems/invalid-option", "/dimensions");
    }

    [Fact]
    public async Task AZeroUnderRejectIsA422AtTheCell()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3], [1, 0, 3], [2, 2, 2]]}");
        await response.Problem(422, "/problems/zero-value", "/rows/1/1");
    }

    [Fact]
    public async Task TheBiplotHasAPointPerSampleAndALabelledArrowPerPart()
    {
        var request = "{" + SeededTable.Fields(SeededTable.Values(33, 15, 5), ids: true) + ", \"weights\": \"mean\"}";
        using var client = factory.CreateClient();
        using var json = await client.PostJson(Path, request);
        var body = await json.OkJson();
        using var response = await client.PostJson(Path, request, "image/svg+xml");
        Assert.Equal("image/svg+xml", response.Content.Headers.ContentType?.MediaType);
        var svg = XDocument.Parse(await response.Content.ReadAsStringAsync()).Root!;

        Assert.NotNull(svg.Attribute("viewBox"));
        Assert.False(string.IsNullOrWhiteSpace(svg.Element(Svg + "title")?.Value));
        Assert.False(string.IsNullOrWhiteSpace(svg.Element(Svg + "desc")?.Value));

        var samples = Group(svg, "samples").Elements(Svg + "circle").ToArray();
        Assert.Equal(15, samples.Length);
        Assert.Equal(Enumerable.Range(0, 15).Select(i => "s" + i.ToString(CultureInfo.InvariantCulture)), samples.Select(c => c.Element(Svg + "title")!.Value.Split(' ')[0]));

        var parts = Group(svg, "parts").Elements(Svg + "g").ToArray();
        Assert.Equal(["p1", "p2", "p3", "p4", "p5"], parts.Select(p => p.Element(Svg + "text")!.Value));
        Assert.All(parts, p => Assert.NotNull(p.Element(Svg + "line")!.Attribute("marker-end")));

        // The arrows keep the directions of the standard coordinates (y is down on the page).
        var standard = body.GetProperty("parts").GetProperty("standard");
        for (var j = 0; j < parts.Length; j++)
        {
            var line = parts[j].Element(Svg + "line")!;
            double dx = Coordinate(line, "x2") - Coordinate(line, "x1"), dy = Coordinate(line, "y1") - Coordinate(line, "y2");
            double sx = standard[j][0].GetDouble(), sy = standard[j][1].GetDouble();
            Assert.True((dx * sx) + (dy * sy) > 0, $"arrow {j} points the wrong way");
        }

        // Axis titles carry the inertia of the JSON answer in percent.
        var texts = svg.Descendants(Svg + "text").Select(t => t.Value).ToArray();
        var inertia = body.GetProperty("inertia");
        Assert.Contains(string.Create(CultureInfo.InvariantCulture, $"Dimension 1 ({inertia[0].GetDouble() * 100:0.0}%)"), texts);
        Assert.Contains(string.Create(CultureInfo.InvariantCulture, $"Dimension 2 ({inertia[1].GetDouble() * 100:0.0}%)"), texts);
    }

    [Fact]
    public async Task TheBiplotUsesTwoDimensionsWhateverWasAsked()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + SeededTable.Fields(SeededTable.Values(34, 8, 4)) + ", \"dimensions\": 1}", "image/svg+xml");
        Assert.Equal("image/svg+xml", response.Content.Headers.ContentType?.MediaType);
        var svg = XDocument.Parse(await response.Content.ReadAsStringAsync()).Root!;
        Assert.Contains(svg.Descendants(Svg + "text"), t => t.Value.StartsWith("Dimension 2 (", StringComparison.Ordinal));
    }

    [Fact]
    public async Task ABiplotOfTwoPartsIsA422()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2], [2, 1], [3, 1]]}", "image/svg+xml");
        await response.Problem(422, "/problems/invalid-option", "/dimensions");
    }

    private static double Coordinate(XElement element, string name) => double.Parse(element.Attribute(name)!.Value, CultureInfo.InvariantCulture);

    private static XElement Group(XElement svg, string cssClass) =>
        svg.Descendants(Svg + "g").Single(g => (string?)g.Attribute("class") == cssClass);
}
