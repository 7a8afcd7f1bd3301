using System.Globalization;
using System.Text.Json;
using System.Xml.Linq;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Selection;

public class RatioSelectionTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/ratio-selection";
    private static readonly XNamespace Svg = "http://www.w3.org/2000/svg";
    private static readonly double L = Math.Log(2);

    /// <summary>Rows (1, 1, 1), (2, 1, 1), (4, 1, 1): only ln a varies, by 0, l, 2l.</summary>
    private const string OneVaryingPart = "\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 1, 1], [2, 1, 1], [4, 1, 1]]";

    private static string Table(int seed, int n, int j) => SeededTable.Fields(SeededTable.Values(seed, n, j));

    [Fact]
    public async Task WhenOnePartVariesItsFirstRatioExplainsEverything()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + OneVaryingPart + "}");
        var body = await response.OkJson();

        // By hand: ln a = s ∈ {0, l, 2l}; clr = s (2/3, −1/3, −1/3), so TV = (1/3)(6/9) var_n(s) = (2/9)(2l²/3) = 4l²/27.
        Tolerance.Close(4 * L * L / 27, body.GetProperty("totalVariance").GetDouble(), 1e-14, 1e-12);
        Assert.Equal("n", body.GetProperty("divisor").GetString());

        // a/b and a/c both explain all of it (b/c nothing); the tie goes to the first pair, a/b, and the stop at 1 ends the path.
        var steps = body.GetProperty("steps");
        Assert.Equal(1, steps.GetArrayLength());
        var step = steps[0];
        Assert.Equal("a/b", step.GetProperty("label").GetString());
        Assert.Equal(["a"], step.GetProperty("ratio").GetProperty("num").EnumerateArray().Select(e => e.GetString()));
        Assert.Equal(["b"], step.GetProperty("ratio").GetProperty("den").EnumerateArray().Select(e => e.GetString()));
        Assert.Equal("pairwise", step.GetProperty("ratio").GetProperty("kind").GetString());
        Tolerance.Close(1, step.GetProperty("explained").GetDouble(), 1e-12, 0);
        Tolerance.Close(1, step.GetProperty("gain").GetDouble(), 1e-12, 0);
        Tolerance.Close(1, step.GetProperty("procrustes").GetDouble(), 1e-12, 0);
        Assert.False(step.GetProperty("forced").GetBoolean());
        Assert.False(body.GetProperty("invertible").GetBoolean());
    }

    [Fact]
    public async Task ASpanningTreeOfPairwiseRatiosExplainsAllTheVariance()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + Table(11, 30, 6) + "}");
        var body = await response.OkJson();

        // Greenacre 2019 (Math. Geosci. 51:649-682): J − 1 pairwise ratios forming a spanning tree explain all of it.
        var steps = body.GetProperty("steps").EnumerateArray().ToArray();
        Assert.Equal(5, steps.Length);
        Tolerance.Close(1, steps[^1].GetProperty("explained").GetDouble(), 1e-9, 0);

        // Procrustes compares configurations up to rotation and scale; ratio columns are not an isometry of the clr, so it stays below 1.
        Assert.InRange(steps[^1].GetProperty("procrustes").GetDouble(), 0.5, 1 - 1e-6);
        var graph = body.GetProperty("graph");
        Assert.True(graph.GetProperty("acyclic").GetBoolean());
        Assert.True(graph.GetProperty("connected").GetBoolean());
        Assert.Equal(6, graph.GetProperty("nodes").GetArrayLength());
        Assert.True(body.GetProperty("invertible").GetBoolean());

        // Explained grows by each gain, and gains are positive.
        var previous = 0.0;
        foreach (var step in steps)
        {
            var explained = step.GetProperty("explained").GetDouble();
            Tolerance.Close(explained - previous, step.GetProperty("gain").GetDouble(), 1e-12, 1e-12);
            Assert.True(step.GetProperty("gain").GetDouble() > 0);
            previous = explained;
        }

        // Edges go from numerator to denominator, labelled as the steps.
        var edges = graph.GetProperty("edges").EnumerateArray().ToArray();
        for (var i = 0; i < steps.Length; i++)
        {
            Assert.Equal(steps[i].GetProperty("label").GetString(), edges[i].GetProperty("label").GetString());
            Assert.Equal(steps[i].GetProperty("ratio").GetProperty("num")[0].GetString(), edges[i].GetProperty("from").GetString());
            Assert.Equal(steps[i].GetProperty("ratio").GetProperty("den")[0].GetString(), edges[i].GetProperty("to").GetString());
        }
    }

    [Fact]
    public async Task MomentsOfTheTableGiveTheSamePath()
    {
        var values = SeededTable.Values(12, 40, 5);
        const string amalgamations = "\"amalgamations\": {\"first\": [\"p1\", \"p2\"], \"last\": [\"p4\", \"p5\"]}";
        using var client = factory.CreateClient();
        using var fromTable = await client.PostJson(Path, "{" + SeededTable.Fields(values) + ", " + amalgamations + "}");
        var table = await fromTable.OkJson();

        // The covariance (n − 1) of the logs of the parts, then of the amalgamations' sums, in that order (API.md).
        var g = values.Select(r => r.Select(v => Math.Log(v)).Append(Math.Log(r[0] + r[1])).Append(Math.Log(r[3] + r[4])).ToArray()).ToArray();
        var moments = "\"moments\": {\"names\": [\"p1\", \"p2\", \"p3\", \"p4\", \"p5\", \"first\", \"last\"], \"covariance\": " +
            SeededTable.Matrix(SeededTable.Covariance(g)) + ", \"count\": 40}";
        using var fromMoments = await client.PostJson(Path, "{" + moments + ", " + amalgamations + "}");
        var body = await fromMoments.OkJson();

        var a = table.GetProperty("steps").EnumerateArray().ToArray();
        var b = body.GetProperty("steps").EnumerateArray().ToArray();
        Assert.Equal(a.Select(s => s.GetProperty("label").GetString()), b.Select(s => s.GetProperty("label").GetString()));
        for (var i = 0; i < a.Length; i++)
        {
            Tolerance.Close(a[i].GetProperty("explained").GetDouble(), b[i].GetProperty("explained").GetDouble(), 1e-9, 1e-9);
            Tolerance.Close(a[i].GetProperty("procrustes").GetDouble(), b[i].GetProperty("procrustes").GetDouble(), 1e-9, 1e-9);
        }

        Tolerance.Close(table.GetProperty("totalVariance").GetDouble(), body.GetProperty("totalVariance").GetDouble(), 1e-12, 1e-9);
        Assert.Empty(body.GetProperty("imputed").EnumerateArray());
    }

    [Fact]
    public async Task AmalgamationRatiosAreLabelledByName()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + Table(13, 25, 5) + ", \"amalgamations\": {\"front\": [\"p1\", \"p2\"]}, " +
            "\"force\": [{\"num\": [\"front\"], \"den\": [\"p3\"]}], \"stop\": {\"maxRatios\": 2}}");
        var body = await response.OkJson();
        var first = body.GetProperty("steps")[0];
        Assert.Equal("front/p3", first.GetProperty("label").GetString());
        Assert.True(first.GetProperty("forced").GetBoolean());
        Assert.Equal("amalgamation", first.GetProperty("ratio").GetProperty("kind").GetString());
        Assert.Equal(["p1", "p2"], first.GetProperty("ratio").GetProperty("num").EnumerateArray().Select(e => e.GetString()));
        Assert.Equal(2, body.GetProperty("steps").GetArrayLength());
        Assert.Contains("front", body.GetProperty("graph").GetProperty("nodes").EnumerateArray().Select(e => e.GetString()));
    }

    [Fact]
    public async Task ExcludedPartsAppearInNoRatio()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + Table(14, 25, 5) + ", \"exclude\": [\"p2\"]}");
        var body = await response.OkJson();

        // Usable parts − 1 = 3 ratios by default; none uses p2, and a tree over the other four explains less than 1.
        var steps = body.GetProperty("steps").EnumerateArray().ToArray();
        Assert.Equal(3, steps.Length);
        Assert.All(steps, s => Assert.DoesNotContain("p2", s.GetProperty("label").GetString()!, StringComparison.Ordinal));
        Assert.True(steps[^1].GetProperty("explained").GetDouble() < 1 - 1e-6);
    }

    [Fact]
    public async Task StopExplainedIncludesTheStepThatReachesIt()
    {
        using var client = factory.CreateClient();
        using var all = await client.PostJson(Path, "{" + Table(15, 30, 6) + "}");
        var path = (await all.OkJson()).GetProperty("steps").EnumerateArray().Select(s => s.GetProperty("explained").GetDouble()).ToArray();
        var target = (path[1] + path[2]) / 2;
        using var response = await client.PostJson(Path, "{" + Table(15, 30, 6) + ", \"stop\": {\"explained\": " + target.ToString("R", CultureInfo.InvariantCulture) + "}}");
        var body = await response.OkJson();
        Assert.Equal(3, body.GetProperty("steps").GetArrayLength());
    }

    [Fact]
    public async Task CsvTableWithQueryOptionsGivesTheJsonPath()
    {
        var values = SeededTable.Values(16, 20, 4);
        var csv = "id," + string.Join(",", SeededTable.Parts(4)) + "\n" + string.Join("\n", values.Select((r, i) => "s" + i.ToString(CultureInfo.InvariantCulture) + "," + string.Join(",", r.Select(v => v.ToString("R", CultureInfo.InvariantCulture))))) + "\n";
        using var client = factory.CreateClient();
        using var fromCsv = await client.PostCsv(Path + "?maxRatios=2&weights=mean", csv);
        var a = await fromCsv.OkJson();
        using var fromJson = await client.PostJson(Path, "{" + SeededTable.Fields(values) + ", \"stop\": {\"maxRatios\": 2}, \"weights\": \"mean\"}");
        var b = await fromJson.OkJson();
        Assert.Equal(2, a.GetProperty("steps").GetArrayLength());
        Assert.Equal(b.GetProperty("steps").ToString(), a.GetProperty("steps").ToString());
    }

    [Theory]
    [InlineData("\"amalgamations\": {\"front\": [\"p1\", \"zz\"]}", 422, "/problems/unknown-part", "/amalgamations/front/1")]
    [InlineData("\"amalgamations\": {\"front\": [\"p1\"]}", 400, "/problems/invalid-input", "/amalgamations/front")]
    [InlineData("\"amalgamations\": {\"front\": [\"p1\", \"p1\"]}", 400, "/problems/invalid-input", "/amalgamations/front/1")]
    [InlineData("\"amalgamations\": {\"p1\": [\"p2\", \"p3\"]}", 400, "/problems/invalid-input", "/amalgamations/p1")]
    [InlineData("\"force\": [{\"num\": [\"p1\", \"p2\"], \"den\": [\"p2\"], \"kind\": \"amalgamation\"}]", 422, "/problems/invalid-ratio", "/force/0")]
    [InlineData("\"force\": [{\"num\": [\"zz\"], \"den\": [\"p2\"]}]", 422, "/problems/unknown-part", "/force/0/num/0")]
    [InlineData("\"force\": [{\"num\": [\"p1\"], \"den\": [\"p2\"]}, {\"num\": [\"p1\"], \"den\": [\"p2\"]}]", 422, "/problems/dependent-ratio", "/force/1")]
    [InlineData("\"force\": [{\"num\": [\"p1\"], \"den\": [\"p2\"]}, {\"num\": [\"p2\"], \"den\": [\"p3\"]}, {\"num\": [\"p1\"], \"den\": [\"p3\"]}]", 422, "/problems/dependent-ratio", "/force/2")]
    [InlineData("\"force\": [null]", 400, "/problems/invalid-input", "/force/0")]
    [InlineData("\"exclude\": [\"p1\", \"p2\", \"p3\", \"p4\"]", 422, "/problems/invalid-option", "/exclude")]
    [InlineData("\"exclude\": [\"zz\"]", 422, "/problems/unknown-part", "/exclude/0")]
    [InlineData("\"stop\": {\"explained\": 0}", 422, "/problems/invalid-option", "/stop/explained")]
    [InlineData("\"stop\": {\"explained\": 1.5}", 422, "/problems/invalid-option", "/stop/explained")]
    [InlineData("\"stop\": {\"maxRatios\": 0}", 422, "/problems/invalid-option", "/stop/maxRatios")]
    [InlineData("\"weights\": {\"p1\": 1}", 422, "/problems/invalid-weights", "/weights")]
    public async Task BadOptionsAreRefusedWithAPointer(string options, int status, string type, string pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + Table(17, 10, 5) + ", " + options + "}");
        await response.Problem(status, type, pointer);
    }

    [Theory]
    [InlineData("\"names\": [\"a\", \"b\"], \"covariance\": [[1, 0.5], [0.4, 1]], \"count\": 10", "/problems/invalid-moments", "/moments/covariance")]
    [InlineData("\"names\": [\"a\", \"b\"], \"covariance\": [[1, 2], [2, 1]], \"count\": 10", "/problems/invalid-moments", "/moments/covariance")]
    [InlineData("\"names\": [\"a\", \"b\", \"c\"], \"covariance\": [[1, 0], [0, 1]], \"count\": 10", "/problems/invalid-moments", "/moments/covariance")]
    [InlineData("\"names\": [\"a\", \"b\"], \"covariance\": [[1, 0], [0, 1]], \"count\": 1", "/problems/invalid-moments", "/moments/count")]
    [InlineData("\"names\": [\"a\", \"a\"], \"covariance\": [[1, 0], [0, 1]], \"count\": 10", "/problems/invalid-moments", "/moments/names/1")]
    public async Task MomentsThatAreNotACovarianceAreA422(string moments, string type, string pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"moments\": {" + moments + "}}");
        await response.Problem(422, type, pointer);
    }

    [Fact]
    public async Task MomentsWhoseNamesDoNotEndWithTheAmalgamationsAreA422()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"moments\": {\"names\": [\"a\", \"b\", \"c\", \"other\"], \"covariance\": [[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]], \"count\": 10}, " +
            "\"amalgamations\": {\"ab\": [\"a\", \"b\"]}}");
        await response.Problem(422, "/problems/invalid-moments", "/moments/names/3");
    }

    [Fact]
    public async Task MeanWeightsNeedTheTable()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"moments\": {\"names\": [\"a\", \"b\", \"c\"], \"covariance\": [[1, 0, 0], [0, 1, 0], [0, 0, 1]], \"count\": 10}, \"weights\": \"mean\"}");
        await response.Problem(422, "/problems/invalid-weights", "/weights");
    }

    [Fact]
    public async Task BothATableAndMomentsAreA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{" + OneVaryingPart + ", \"moments\": {\"names\": [\"a\", \"b\"], \"covariance\": [[1, 0], [0, 1]], \"count\": 3}}");
        await response.Problem(400, "/problems/invalid-input", "/moments");
    }

    [Fact]
    public async Task NeitherATableNorMomentsIsA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"stop\": {\"maxRatios\": 2}}");
        await response.Problem(400, "/problems/invalid-input", "");
    }

    [Fact]
    public async Task ANaNLiteralIsA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"moments\": {\"names\": [\"a\", \"b\"], \"covariance\": [[NaN, 0], [0, 1]], \"count\": 3}}");
        await response.Problem(400, "/problems/invalid-input");
    }

    [Fact]
    public async Task TheSvgShowsTheGraphAndTheCurve()
    {
        using var client = factory.CreateClient();
        var request = "{" + Table(18, 30, 5) + ", \"amalgamations\": {\"front\": [\"p1\", \"p2\"]}}";
        using var json = await client.PostJson(Path, request);
        var body = await json.OkJson();
        using var response = await client.PostJson(Path, request, "image/svg+xml");
        Assert.Equal("image/svg+xml", response.Content.Headers.ContentType?.MediaType);
        var svg = XDocument.Parse(await response.Content.ReadAsStringAsync()).Root!;

        Assert.Equal(Svg + "svg", svg.Name);
        Assert.NotNull(svg.Attribute("viewBox"));
        Assert.False(string.IsNullOrWhiteSpace(svg.Element(Svg + "title")?.Value));
        Assert.False(string.IsNullOrWhiteSpace(svg.Element(Svg + "desc")?.Value));

        var steps = body.GetProperty("steps").EnumerateArray().ToArray();
        var nodes = body.GetProperty("graph").GetProperty("nodes").EnumerateArray().Select(n => n.GetString()).ToArray();
        var nodeTexts = Group(svg, "nodes").Elements(Svg + "text").Select(t => t.Value).ToArray();
        Assert.Equal(nodes, nodeTexts);
        var edges = Group(svg, "edges").Elements(Svg + "g").ToArray();
        Assert.Equal(steps.Length, edges.Length);
        for (var i = 0; i < steps.Length; i++)
        {
            Assert.NotNull(edges[i].Element(Svg + "line")?.Attribute("marker-end"));
            Assert.Equal((i + 1).ToString(CultureInfo.InvariantCulture), edges[i].Element(Svg + "text")!.Value);
            Assert.Contains(steps[i].GetProperty("label").GetString()!, edges[i].Element(Svg + "line")!.Element(Svg + "title")!.Value, StringComparison.Ordinal);
        }

        var curve = Group(svg, "curve-group");
        var points = curve.Element(Svg + "polyline")!.Attribute("points")!.Value.Split(' ');
        Assert.Equal(steps.Length, points.Length);
        var markers = curve.Elements(Svg + "circle").ToArray();
        Assert.Equal(steps.Length, markers.Length);
        for (var i = 0; i < steps.Length; i++)
        {
            var explained = steps[i].GetProperty("explained").GetDouble().ToString("0.0000", CultureInfo.InvariantCulture);
            Assert.EndsWith("explained " + explained, markers[i].Element(Svg + "title")!.Value, StringComparison.Ordinal);
        }

        // Higher explained fractions sit higher on the page (smaller y).
        var ys = points.Select(p => double.Parse(p.Split(',')[1], CultureInfo.InvariantCulture)).ToArray();
        Assert.True(ys.Zip(ys.Skip(1)).All(p => p.Second <= p.First));
    }

    [Fact]
    public async Task WithoutAPreferenceForSvgTheAnswerIsJson()
    {
        using var client = factory.CreateClient();
        using var wildcard = await client.PostJson(Path, "{" + OneVaryingPart + "}", "*/*");
        await wildcard.OkJson();
        using var lower = await client.PostJson(Path, "{" + OneVaryingPart + "}", "application/json, image/svg+xml;q=0.5");
        await lower.OkJson();
    }

    private static XElement Group(XElement svg, string cssClass) =>
        svg.Descendants(Svg + "g").Single(g => (string?)g.Attribute("class") == cssClass);
}
