using System.Globalization;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Selection;

public class RatioSetTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Evaluate = "/v1/ratio-sets/evaluate";
    private const string Reconstruct = "/v1/ratio-sets/reconstruct";
    private const string Inverse = "/v1/coordinates/inverse";
    private static readonly double L = WorkedExample.L;

    private static string R(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    [Fact]
    public async Task ASpanningTreeExplainsEverythingAndIsInvertible()
    {
        using var client = factory.CreateClient();
        var table = SeededTable.Fields(SeededTable.Values(21, 30, 4));
        using var response = await client.PostJson(Evaluate, "{" + table + ", \"ratios\": [{\"num\": [\"p1\"], \"den\": [\"p2\"]}, {\"num\": [\"p2\"], \"den\": [\"p3\"]}, {\"num\": [\"p4\"], \"den\": [\"p2\"]}]}");
        var body = await response.OkJson();

        // Greenacre 2019: a spanning tree of pairwise ratios explains all of the log-ratio variance. Its configuration of
        // samples is not an isometry of the clr one, so the Procrustes correlation stays below 1 (checked against scipy in tests/reference).
        Tolerance.Close(1, body.GetProperty("explained").GetDouble(), 1e-9, 0);
        Assert.InRange(body.GetProperty("procrustes").GetDouble(), 0.5, 1 - 1e-6);
        Assert.Equal(3, body.GetProperty("rank").GetInt32());
        Assert.True(body.GetProperty("invertible").GetBoolean());
        Assert.Equal("n", body.GetProperty("divisor").GetString());
        var per = body.GetProperty("perRatio").EnumerateArray().ToArray();
        Assert.Equal(["p1/p2", "p2/p3", "p4/p2"], per.Select(p => p.GetProperty("label").GetString()));
        Assert.All(per, p => Assert.InRange(p.GetProperty("explainedAlone").GetDouble(), 0, 1));
        Assert.All(per, p => Assert.True(p.GetProperty("uniqueContribution").GetDouble() > 0));
    }

    [Fact]
    public async Task TheOneVaryingRatioExplainsEverythingAlone()
    {
        using var client = factory.CreateClient();

        // Only ln a varies: a/b carries all of it, b/c none; each is needed by nothing else.
        using var response = await client.PostJson(Evaluate, "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 1, 1], [2, 1, 1], [4, 1, 1]], " +
            "\"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"b\"], \"den\": [\"c\"]}]}");
        var body = await response.OkJson();
        Tolerance.Close(1, body.GetProperty("explained").GetDouble(), 1e-12, 0);
        Tolerance.Close(4 * L * L / 27, body.GetProperty("totalVariance").GetDouble(), 1e-14, 1e-12);
        var per = body.GetProperty("perRatio");
        Tolerance.Close(1, per[0].GetProperty("explainedAlone").GetDouble(), 1e-12, 0);
        Tolerance.Close(0, per[1].GetProperty("explainedAlone").GetDouble(), 1e-12, 0);
        Assert.Equal(1, body.GetProperty("rank").GetInt32());
    }

    [Fact]
    public async Task CsvTableWithRatiosInTheQuery()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Evaluate + "?ratio=a/b&ratio=b/c", WorkedExample.Csv);
        var body = await response.OkJson();

        // x₁ = (1, 2, 4), x₂ = (4, 2, 1): a/b and b/c form a tree over the three parts.
        Tolerance.Close(1, body.GetProperty("explained").GetDouble(), 1e-12, 0);
        Assert.True(body.GetProperty("invertible").GetBoolean());
    }

    [Theory]
    [InlineData("\"ratios\": []", 400, "/problems/invalid-input", "/ratios")]
    [InlineData("\"ratios\": [{\"num\": [\"zz\"], \"den\": [\"b\"]}]", 422, "/problems/unknown-part", "/ratios/0/num/0")]
    [InlineData("\"ratios\": [{\"num\": [\"a\", \"b\"], \"den\": [\"b\"], \"kind\": \"amalgamation\"}]", 422, "/problems/invalid-ratio", "/ratios/0")]
    [InlineData("\"ratios\": [{\"num\": [\"a\", \"b\"], \"den\": [\"c\"]}]", 422, "/problems/invalid-ratio", "/ratios/0/kind")]
    public async Task BadRatioSetsAreRefused(string ratios, int status, string type, string pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Evaluate, WorkedExample.Json(ratios));
        await response.Problem(status, type, pointer);
    }

    [Fact]
    public async Task ForwardPairwiseRatiosReconstructTheClosedTable()
    {
        using var client = factory.CreateClient();

        // x₁ = (1, 2, 4): ln(a/b) = −l, ln(c/b) = l; x₂ = (4, 2, 1): l, −l. The closed rows are x / 7 (Aitchison 1986).
        using var response = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"c\"], \"den\": [\"b\"]}], " +
            $"\"rows\": [[{R(-L)}, {R(L)}], [{R(L)}, {R(-L)}]], \"ids\": [\"w1\", \"w2\"]}}");
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
        Tolerance.Close([4 / 7.0, 2 / 7.0, 1 / 7.0], body.GetProperty("rows")[1]);
        Assert.Equal(["w1", "w2"], body.GetProperty("ids").EnumerateArray().Select(e => e.GetString()));
    }

    [Fact]
    public async Task AmalgamationRatiosReconstructByTheLinearEquations()
    {
        using var client = factory.CreateClient();

        // x = (1, 2, 4): ln((a+b)/c) = ln(3/4), ln(a/b) = ln(1/2); with total 7 the solution is (1, 2, 4) (Greenacre 2020).
        using var response = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": [{\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"amalgamation\"}, {\"num\": [\"a\"], \"den\": [\"b\"]}], " +
            $"\"rows\": [[{R(Math.Log(0.75))}, {R(-L)}]], \"total\": 7}}");
        var body = await response.OkJson();
        Tolerance.Close([1, 2, 4], body.GetProperty("rows")[0], 1e-12, 1e-12);
    }

    [Fact]
    public async Task CsvValuesInAndCsvTableOut()
    {
        using var client = factory.CreateClient();
        var csv = $"id,a/b,c/b\nw1,{R(-L)},{R(L)}\n";
        using var response = await client.PostCsv(Reconstruct + "?parts=a,b,c&ratio=a/b&ratio=c/b&total=7", csv, "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("id,a,b,c", lines[0]);
        Tolerance.Close([1, 2, 4], Http.Numbers(lines[1], 1), 1e-12, 1e-12);
    }

    [Fact]
    public async Task AnIncompleteSetIsA422AtTheRatios()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"b\"], \"den\": [\"a\"]}], \"rows\": [[1, -1]]}");
        var problem = await response.Problem(422, "/problems/singular-ratio-set", "/ratios");
        Assert.Contains("c", problem.GetProperty("detail").GetString()!, StringComparison.Ordinal);
    }

    [Fact]
    public async Task TooFewRatiosIsA422AtTheRatios()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}], \"rows\": [[1]]}");
        await response.Problem(422, "/problems/singular-ratio-set", "/ratios");
    }

    [Fact]
    public async Task ValuesThatGiveANegativePartAreA422AtTheRow()
    {
        using var client = factory.CreateClient();

        // Row 0: (a+b)/c = 2 and a/c = 1 give (1, 1, 1) / 3. Row 1: (a+b)/c = 1 and a/c = 2 would need b = −c.
        using var response = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": [{\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"amalgamation\"}, {\"num\": [\"a\"], \"den\": [\"c\"]}], " +
            $"\"rows\": [[{R(Math.Log(2))}, 0], [0, {R(Math.Log(2))}]]}}");
        await response.Problem(422, "/problems/infeasible-ratio-values", "/rows/1");
    }

    [Theory]
    [InlineData("[[NaN, 1]]", "/rows/0/0")]
    [InlineData("[[1e400, 1]]", "/rows/0/0")]
    [InlineData("[[1, -Infinity]]", "/rows/0/1")]
    public async Task NonFiniteValuesAreA400(string rows, string pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"c\"], \"den\": [\"b\"]}], \"rows\": " + rows + "}");
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task CoordinatesInverseOfRatiosUsesTheSameReconstruction()
    {
        using var client = factory.CreateClient();
        var ratios = "[{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"c\"], \"den\": [\"b\"]}]";
        var rows = $"[[{R(-L)}, {R(L)}]]";
        using var inverse = await client.PostJson(Inverse, "{\"parts\": [\"a\", \"b\", \"c\"], \"transform\": {\"type\": \"ratios\", \"ratios\": " + ratios + "}, \"rows\": " + rows + "}");
        var a = await inverse.OkJson();
        Tolerance.Close(WorkedExample.Closed1, a.GetProperty("rows")[0]);
        using var reconstruct = await client.PostJson(Reconstruct, "{\"parts\": [\"a\", \"b\", \"c\"], \"ratios\": " + ratios + ", \"rows\": " + rows + "}");
        var b = await reconstruct.OkJson();
        Assert.Equal(b.GetProperty("rows").ToString(), a.GetProperty("rows").ToString());
    }

    [Fact]
    public async Task CoordinatesInverseOfAnIncompleteSetPointsIntoTheTransform()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Inverse, "{\"parts\": [\"a\", \"b\", \"c\"], \"transform\": {\"type\": \"ratios\", \"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"b\"], \"den\": [\"a\"]}]}, \"rows\": [[1, -1]]}");
        await response.Problem(422, "/problems/singular-ratio-set", "/transform/ratios");
    }
}
