using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Summary;

public class DistancesTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/distances";
    private static readonly double L = WorkedExample.L;

    [Fact]
    public async Task AitchisonDistanceOfTheWorkedExampleIsTwoRootTwoL()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json());
        var body = await response.OkJson();

        // ‖clr(x₁) − clr(x₂)‖ = ‖(−2l, 0, 2l)‖ = 2√2 l (Aitchison et al. 2000, Math. Geol. 32:271-275).
        var d = 2 * Math.Sqrt(2) * L;
        Tolerance.Close([[0, d], [d, 0]], body.GetProperty("matrix"));
        Assert.Equal(["w1", "w2"], body.GetProperty("ids").EnumerateArray().Select(i => i.GetString()));
    }

    [Fact]
    public async Task DistanceDoesNotDependOnUnitsOrClosure()
    {
        using var client = factory.CreateClient();

        // Scale invariance (Aitchison 1986): (1, 2, 4) in mg/L and (400, 200, 100) in other units.
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 4], [400, 200, 100], [2, 4, 8]]}");
        var body = await response.OkJson();
        var m = body.GetProperty("matrix");
        Tolerance.Close(2 * Math.Sqrt(2) * L, m[0][1].GetDouble());
        Tolerance.Close(0, m[0][2].GetDouble(), 1e-12);
        Assert.False(body.TryGetProperty("ids", out _));
    }

    [Fact]
    public async Task CsvOutLabelsColumnsWithTheIds()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path, WorkedExample.Csv, "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("id,w1,w2", lines[0]);
        var d = 2 * Math.Sqrt(2) * L;
        Tolerance.Close([0, d], Http.Numbers(lines[1], 1));
        Tolerance.Close([d, 0], Http.Numbers(lines[2], 1));
    }

    [Fact]
    public async Task CsvOutWithoutIdsLabelsColumnsWithRowNumbers()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path, "a,b,c\n1,2,4\n4,2,1\n", "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("0,1", lines[0]);
        Tolerance.Close([0, 2 * Math.Sqrt(2) * L], Http.Numbers(lines[1]));
    }

    [Fact]
    public async Task CsvZeroPolicyFromTheQuery()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?zeros=bayesian-multiplicative&prior=perks", "a,b,c\n0,3,7\n1,3,6\n");
        var body = await response.OkJson();
        Assert.Equal(1, body.GetProperty("imputed").GetArrayLength());
    }
}
