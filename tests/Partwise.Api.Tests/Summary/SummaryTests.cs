using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Summary;

public class SummaryTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/summary";
    private static readonly double L2 = WorkedExample.L * WorkedExample.L;

    [Fact]
    public async Task SummaryOfTheWorkedExampleMatchesTheHandComputation()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json());
        var body = await response.OkJson();

        // Geometric means per part: √(1·4) = √(2·2) = √(4·1) = 2, closed: (1/3, 1/3, 1/3) (Aitchison 1986).
        Tolerance.Close([1 / 3.0, 1 / 3.0, 1 / 3.0], body.GetProperty("center"));

        // Variation matrix, divisor n − 1 = 1: ln(a/b) = (−l, l) → 2l²; ln(a/c) = (−2l, 2l) → 8l²; ln(b/c) → 2l² (Aitchison 1986).
        Tolerance.Close([[0, 2 * L2, 8 * L2], [2 * L2, 0, 2 * L2], [8 * L2, 2 * L2, 0]], body.GetProperty("variationMatrix"));

        // TV = Σ_{a<b} w_a w_b T_ab = (2 + 8 + 2) l² / 9 = 4l²/3 (Greenacre 2019); clr = ±(−l, 0, l), so the
        // contributions w_j var(clr_j) / TV are (1/2, 0, 1/2).
        Tolerance.Close(4 * L2 / 3, body.GetProperty("totalVariance").GetDouble());
        Tolerance.Close([0.5, 0, 0.5], body.GetProperty("partContributions"));
        Tolerance.Close([[2 * L2, 0, -2 * L2], [0, 0, 0], [-2 * L2, 0, 2 * L2]], body.GetProperty("clrCovariance"));
        Tolerance.Close([1 / 3.0, 1 / 3.0, 1 / 3.0], body.GetProperty("weights"));
        Assert.Equal("n-1", body.GetProperty("divisor").GetString());
        Assert.Equal(0, body.GetProperty("imputed").GetArrayLength());
    }

    [Fact]
    public async Task MeanWeightsAreTheMeanClosedProportions()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"weights\": \"mean\""));
        var body = await response.OkJson();

        // Closed rows (1, 2, 4)/7 and (4, 2, 1)/7: w = (5, 4, 5)/14 (Greenacre & Lewi 2009).
        Tolerance.Close([5 / 14.0, 4 / 14.0, 5 / 14.0], body.GetProperty("weights"));

        // TV = w_a w_b 2l² + w_a w_c 8l² + w_b w_c 2l² = (40 + 200 + 40) l² / 196 = 10 l² / 7 (Greenacre 2019).
        Tolerance.Close(10 * L2 / 7, body.GetProperty("totalVariance").GetDouble());
    }

    [Fact]
    public async Task GivenWeightsAreNormalised()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"weights\": {\"a\": 2, \"b\": 2, \"c\": 4}"));
        var body = await response.OkJson();
        Tolerance.Close([0.25, 0.25, 0.5], body.GetProperty("weights"));

        // TV = (1/16) 2l² + (1/8) 8l² + (1/8) 2l² = (1/8 + 1 + 1/4) l² = 11 l² / 8.
        Tolerance.Close(11 * L2 / 8, body.GetProperty("totalVariance").GetDouble());
    }

    [Fact]
    public async Task CsvWithMeanWeightsFromTheQuery()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?weights=mean", WorkedExample.Csv);
        var body = await response.OkJson();
        Tolerance.Close(10 * L2 / 7, body.GetProperty("totalVariance").GetDouble());
    }

    [Fact]
    public async Task TheSummaryIsJsonEvenWhenCsvIsAskedFor()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path, WorkedExample.Csv, "text/csv");
        await response.OkJson();
    }

    [Fact]
    public async Task ASingleRowHasNoVariance()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]]}");
        await response.Problem(400, "/problems/invalid-input", "/rows");
    }

    [Fact]
    public async Task UnknownWeightPartsAreA422AtTheirName()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"weights\": {\"a\": 1, \"b\": 1, \"Cl\": 1}"));
        await response.Problem(422, "/problems/unknown-part", "/weights/Cl");
    }

    [Fact]
    public async Task ANegativeWeightIsA422AtItsPart()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"weights\": {\"a\": 1, \"b\": -1, \"c\": 1}"));
        await response.Problem(422, "/problems/invalid-weights", "/weights/b");
    }

    [Fact]
    public async Task AnUnknownWeightsNameIsA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"weights\": \"heavy\""));
        await response.Problem(400, "/problems/invalid-input", "/weights");
    }

    [Fact]
    public async Task WeightsOfTheWrongJsonTypeAreA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, WorkedExample.Json("\"weights\": [1, 2, 3]"));
        await response.Problem(400, "/problems/invalid-input", "/weights");
    }
}
