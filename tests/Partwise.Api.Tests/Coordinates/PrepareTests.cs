using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Coordinates;

public class PrepareTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/compositions/prepare";

    [Fact]
    public async Task PrepareClosesEveryRowToOneByDefault()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json());
        var body = await response.OkJson();

        // C(x) = x / Σx (Aitchison 1986): (1, 2, 4) / 7 and (4, 2, 1) / 7.
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
        Tolerance.Close([4 / 7.0, 2 / 7.0, 1 / 7.0], body.GetProperty("rows")[1]);
        Assert.Equal(["a", "b", "c"], body.GetProperty("parts").EnumerateArray().Select(p => p.GetString()));
        Assert.Equal(["w1", "w2"], body.GetProperty("ids").EnumerateArray().Select(p => p.GetString()));
        Assert.Equal(0, body.GetProperty("imputed").GetArrayLength());
    }

    [Fact]
    public async Task PrepareClosesToTheGivenTotal()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"total\": 100"));
        var body = await response.OkJson();
        Tolerance.Close([100 / 7.0, 200 / 7.0, 400 / 7.0], body.GetProperty("rows")[0], 1e-12, 1e-13);
    }

    [Fact]
    public async Task MultiplicativeReplacementListsTheCellWithItsClosedValue()
    {
        using var client = factory.CreateClient();
        var json = "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[0, 2, 4]], " +
            "\"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": {\"a\": 0.1}, \"fraction\": 0.65}, \"total\": 1}";
        using var response = await client.PostJson(Path, json);
        var body = await response.OkJson();

        // Martín-Fernández, Barceló-Vidal & Pawlowsky-Glahn 2003: δ = 0.65 · 0.1 = 0.065, c = 6; the other cells
        // become x (1 − δ / c); the row sums to c again and is then closed to 1 (worked by hand).
        const double delta = 0.065, c = 6;
        var expected = new[] { delta / c, 2 * (1 - (delta / c)) / c, 4 * (1 - (delta / c)) / c };
        Tolerance.Close(expected, body.GetProperty("rows")[0]);
        var imputed = Assert.Single(body.GetProperty("imputed").EnumerateArray());
        Assert.Equal(0, imputed.GetProperty("row").GetInt32());
        Assert.Equal("a", imputed.GetProperty("part").GetString());
        Tolerance.Close(delta / c, imputed.GetProperty("value").GetDouble());
    }

    [Fact]
    public async Task OneDetectionLimitForAllPartsIsANumber()
    {
        using var client = factory.CreateClient();
        var json = "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[0, 2, 4], [1, 0, 3]], \"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": 0.1}}";
        using var response = await client.PostJson(Path, json);
        var body = await response.OkJson();

        // Default fraction 0.65 (common practice): δ = 0.065 in both rows; row 2 has c = 4.
        var cells = body.GetProperty("imputed").EnumerateArray().ToArray();
        Assert.Equal(2, cells.Length);
        Tolerance.Close(0.065 / 6, cells[0].GetProperty("value").GetDouble());
        Assert.Equal(1, cells[1].GetProperty("row").GetInt32());
        Assert.Equal("b", cells[1].GetProperty("part").GetString());
        Tolerance.Close(0.065 / 4, cells[1].GetProperty("value").GetDouble());
    }

    [Fact]
    public async Task BayesianMultiplicativeReplacementFollowsThePerksPrior()
    {
        using var client = factory.CreateClient();
        var json = "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[0, 3, 7]], \"zeros\": {\"method\": \"bayesian-multiplicative\", \"prior\": \"perks\"}}";
        using var response = await client.PostJson(Path, json);
        var body = await response.OkJson();

        // Martín-Fernández et al. 2015: N = 10, t = 1/3, Perks s = 1; zero r = t s / (N + s) = 1/33;
        // non-zero r = (n / N)(1 − 1/33).
        var expected = new[] { 1 / 33.0, 0.3 * 32 / 33, 0.7 * 32 / 33 };
        Tolerance.Close(expected, body.GetProperty("rows")[0]);
        Tolerance.Close(1 / 33.0, body.GetProperty("imputed")[0].GetProperty("value").GetDouble());
    }

    [Fact]
    public async Task CsvInAndCsvOutGiveTheClosedTableWithIds()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?total=7", WorkedExample.Csv, "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("id,a,b,c", lines[0]);
        Assert.StartsWith("w1,", lines[1], StringComparison.Ordinal);

        // 7 · (1, 2, 4) / 7 = (1, 2, 4), written with round-trip precision.
        Tolerance.Close([1, 2, 4], Http.Numbers(lines[1], 1), 1e-12, 1e-14);
        Tolerance.Close([4, 2, 1], Http.Numbers(lines[2], 1), 1e-12, 1e-14);
        Assert.Equal("0", Assert.Single(response.Headers.GetValues("Imputed-Cells")));
    }

    [Fact]
    public async Task CsvZeroOptionsComeFromTheQuery()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?zeros=multiplicative&detectionLimit=0.1&fraction=0.5", "a,b,c\n0,2,4\n", "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("a,b,c", lines[0]);

        // δ = 0.5 · 0.1 = 0.05, c = 6 (Martín-Fernández et al. 2003), closed to 1.
        Tolerance.Close([0.05 / 6, 2 * (1 - (0.05 / 6)) / 6, 4 * (1 - (0.05 / 6)) / 6], Http.Numbers(lines[1]));
        Assert.Equal("1", Assert.Single(response.Headers.GetValues("Imputed-Cells")));
    }

    [Fact]
    public async Task CsvBodyCanAnswerInJson()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path, WorkedExample.Csv);
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
        Assert.Equal("w2", body.GetProperty("ids")[1].GetString());
    }

    [Fact]
    public async Task JsonBodyCanAnswerInCsv()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 3]]}", "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal(["a,b", "0.25,0.75"], lines);
    }

    [Theory]
    [InlineData("text/csv;q=0.5, application/json", "application/json")]
    [InlineData("application/json;q=0.5, text/csv", "text/csv")]
    [InlineData("*/*", "application/json")]
    [InlineData("text/csv, application/json", "application/json")]
    public async Task AcceptChoosesBetweenJsonAndCsv(string accept, string expected)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 3]]}", accept);
        Assert.Equal(expected, response.Content.Headers.ContentType?.MediaType);
    }
}
