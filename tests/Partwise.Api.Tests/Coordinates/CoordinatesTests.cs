using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Coordinates;

public class CoordinatesTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/coordinates";
    private static readonly double L = WorkedExample.L;

    [Fact]
    public async Task ClrOfTheWorkedExampleIsMinusLZeroL()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"clr\"}"));
        var body = await response.OkJson();
        Assert.Equal(["clr(a)", "clr(b)", "clr(c)"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));
        Tolerance.Close(WorkedExample.Clr1, body.GetProperty("rows")[0]);

        // x₂ = (4, 2, 1) mirrors x₁, so clr(x₂) = (l, 0, −l).
        Tolerance.Close([L, 0, -L], body.GetProperty("rows")[1]);
        Assert.Equal("w1", body.GetProperty("ids")[0].GetString());
        Assert.False(body.TryGetProperty("basis", out _));
    }

    [Fact]
    public async Task WeightedClrCentresOnTheWeightedMeanLog()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"clr\", \"weights\": {\"a\": 1, \"b\": 1, \"c\": 2}}"));
        var body = await response.OkJson();

        // Greenacre & Lewi 2009: w = (1/4, 1/4, 1/2); Σ w ln x₁ = l/4 + l = 1.25 l; clr_w = (0, l, 2l) − 1.25 l.
        Tolerance.Close([-1.25 * L, -0.25 * L, 0.75 * L], body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task AlrUsesTheLastPartByDefault()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"alr\"}"));
        var body = await response.OkJson();
        Assert.Equal(["a/c", "b/c"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));
        Tolerance.Close(WorkedExample.Alr1, body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task AlrTakesANamedDenominator()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"alr\", \"denominator\": \"a\"}"));
        var body = await response.OkJson();

        // ln(2/1), ln(4/1) for x₁ (Aitchison 1986).
        Assert.Equal(["b/a", "c/a"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));
        Tolerance.Close([L, 2 * L], body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task IlrDefaultsToPivotCoordinatesAndReturnsTheBasis()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"ilr\"}"));
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Pivot1, body.GetProperty("rows")[0]);

        // Pivot basis for J = 3 (Fišerová & Hron 2011): column 1 = √(2/3)(1, −1/2, −1/2), column 2 = √(1/2)(0, 1, −1).
        var s = Math.Sqrt(2.0 / 3);
        Tolerance.Close([[s, 0], [-s / 2, Math.Sqrt(0.5)], [-s / 2, -Math.Sqrt(0.5)]], body.GetProperty("basis"));
        Assert.Equal(["g(a)/g(b,c)", "g(b)/g(c)"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));
    }

    [Fact]
    public async Task IlrFromASequentialBinaryPartitionGivesItsBalances()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"ilr\", \"partition\": [[1, 1, -1], [1, -1, 0]]}"));
        var body = await response.OkJson();

        // Egozcue & Pawlowsky-Glahn 2005: row 1 (r = 2, s = 1) is √(2/3) ln(√(x_a x_b) / x_c) = √(2/3)(0.5 l − 2l);
        // row 2 is √(1/2) ln(x_a / x_b) = −l/√2. Coefficients +√(s / (r(r+s))), −√(r / (s(r+s))).
        Tolerance.Close([Math.Sqrt(2.0 / 3) * -1.5 * L, -L / Math.Sqrt(2)], body.GetProperty("rows")[0]);
        Tolerance.Close([[1 / Math.Sqrt(6), Math.Sqrt(0.5)], [1 / Math.Sqrt(6), -Math.Sqrt(0.5)], [-Math.Sqrt(2.0 / 3), 0]], body.GetProperty("basis"));
        Assert.Equal(["g(a,b)/g(c)", "g(a)/g(b)"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));
    }

    [Fact]
    public async Task PairwiseGivesEveryLogRatioOnce()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"pairwise\"}"));
        var body = await response.OkJson();
        Assert.Equal(["a/b", "a/c", "b/c"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));
        Tolerance.Close(WorkedExample.Pairwise1, body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task RatioSetsMixPairwiseAmalgamationAndBalanceRatios()
    {
        using var client = factory.CreateClient();
        var ratios = "\"transform\": {\"type\": \"ratios\", \"ratios\": [" +
            "{\"num\": [\"a\"], \"den\": [\"c\"]}, " +
            "{\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"amalgamation\"}, " +
            "{\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"balance\"}]}";
        using var response = await client.PostJson(Path, WorkedExample.Json(ratios));
        var body = await response.OkJson();
        Assert.Equal(["a/c", "(a+b)/c", "g(a,b)/g(c)"], body.GetProperty("columns").EnumerateArray().Select(c => c.GetString()));

        // ln(1/4); ln((1 + 2)/4) (Aitchison 1986, amalgamation); √(2/3) ln(√2 / 4) (Egozcue & Pawlowsky-Glahn 2005).
        Tolerance.Close([-2 * L, Math.Log(0.75), Math.Sqrt(2.0 / 3) * -1.5 * L], body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task ZerosAreReplacedBeforeTheTransformAndListed()
    {
        using var client = factory.CreateClient();
        var json = "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[0, 2, 4]], \"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": 0.1}, \"transform\": {\"type\": \"alr\"}}";
        using var response = await client.PostJson(Path, json);
        var body = await response.OkJson();

        // δ = 0.065, c = 6: a = 0.065, c becomes 4 (1 − 0.065/6) (Martín-Fernández et al. 2003).
        Tolerance.Close(Math.Log(0.065 / (4 * (1 - (0.065 / 6)))), body.GetProperty("rows")[0][0].GetDouble());
        Tolerance.Close(Math.Log(0.5), body.GetProperty("rows")[0][1].GetDouble());
        var cell = Assert.Single(body.GetProperty("imputed").EnumerateArray());
        Tolerance.Close(0.065, cell.GetProperty("value").GetDouble());
    }

    [Fact]
    public async Task CsvInWithQueryOptionsAndCsvOut()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?transform=alr&denominator=c", WorkedExample.Csv, "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("id,a/c,b/c", lines[0]);
        Assert.StartsWith("w1,", lines[1], StringComparison.Ordinal);
        Tolerance.Close(WorkedExample.Alr1, Http.Numbers(lines[1], 1));
        Tolerance.Close([2 * L, L], Http.Numbers(lines[2], 1));
    }

    [Fact]
    public async Task CsvOutputRoundTripsEveryDigit()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?transform=clr", "a,b,c\n1,2,4\n", "text/csv");
        var lines = await response.OkCsv();

        // "R" formatting: parsing the text gives back the very same double as ln 2.
        var values = Http.Numbers(lines[1]);
        Assert.Equal(-L, values[0]);
        Assert.Equal(L, values[2]);
    }

    [Fact]
    public async Task CsvWithClrMeanWeightsFromTheQuery()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?transform=clr&weights=mean", WorkedExample.Csv);
        var body = await response.OkJson();

        // Mean closed proportions w = (5/14, 4/14, 5/14) (Greenacre & Lewi 2009): Σ w ln x₁ = (4l + 10l)/14 = l.
        Tolerance.Close([-L, 0, L], body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task UnknownMembersAreIgnored()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"transform\": {\"type\": \"clr\", \"note\": \"later\"}, \"comment\": {\"x\": [1, 2]}"));
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Clr1, body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task AJsonSuffixMediaTypeIsReadAsJson()
    {
        using var client = factory.CreateClient();
        using var response = await client.Post(Path, WorkedExample.Json("\"transform\": {\"type\": \"clr\"}"), "application/vnd.partwise+json; charset=utf-8");
        await response.OkJson();
    }
}
