using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Coordinates;

public class InverseTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Path = "/v1/coordinates/inverse";
    private static readonly double L = WorkedExample.L;

    private static string Request(string transform, double[] row, string extra = "") =>
        "{\"parts\": [\"a\", \"b\", \"c\"], \"transform\": " + transform + ", \"rows\": [[" +
        string.Join(", ", row.Select(v => v.ToString("R", System.Globalization.CultureInfo.InvariantCulture))) + "]]" + extra + "}";

    [Fact]
    public async Task InverseOfClrRecoversTheClosedComposition()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"clr\"}", WorkedExample.Clr1));
        var body = await response.OkJson();

        // C(exp(−l, 0, l)) = C(1/2, 1, 2) = (1, 2, 4) / 7 (Aitchison 1986).
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
        Assert.Equal(["a", "b", "c"], body.GetProperty("parts").EnumerateArray().Select(p => p.GetString()));
    }

    [Fact]
    public async Task InverseOfAlrPutsTheOneAtTheDenominator()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"alr\", \"denominator\": \"b\"}", [-L, L], ", \"total\": 7"));
        var body = await response.OkJson();

        // C([exp(−l), 1, exp(l)]) = C(1/2, 1, 2), times 7: (1, 2, 4).
        Tolerance.Close([1, 2, 4], body.GetProperty("rows")[0], 1e-12, 1e-13);
    }

    [Fact]
    public async Task InverseOfPivotIlrRecoversTheClosedComposition()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"ilr\"}", WorkedExample.Pivot1));
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task InverseOfPartitionIlrUsesThatPartition()
    {
        using var client = factory.CreateClient();
        double[] balances = [Math.Sqrt(2.0 / 3) * -1.5 * L, -L / Math.Sqrt(2)];
        using var response = await client.PostJson(Path, Request("{\"type\": \"ilr\", \"partition\": [[1, 1, -1], [1, -1, 0]]}", balances));
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task CsvCoordinatesInAndCsvTableOut()
    {
        using var client = factory.CreateClient();
        var csv = "id,a/c,b/c\nw1," + (-2 * L).ToString("R", System.Globalization.CultureInfo.InvariantCulture) + "," + (-L).ToString("R", System.Globalization.CultureInfo.InvariantCulture) + "\n";
        using var response = await client.PostCsv(Path + "?parts=a,b,c&transform=alr&total=7", csv, "text/csv");
        var lines = await response.OkCsv();
        Assert.Equal("id,a,b,c", lines[0]);
        Assert.StartsWith("w1,", lines[1], StringComparison.Ordinal);
        Tolerance.Close([1, 2, 4], Http.Numbers(lines[1], 1), 1e-12, 1e-13);
        Assert.False(response.Headers.Contains("Imputed-Cells"));
    }

    [Fact]
    public async Task AWrongNumberOfCoordinatesIsA400AtTheRow()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"alr\"}", [1, 2, 3]));
        await response.Problem(400, "/problems/invalid-input", "/rows/0");
    }

    [Fact]
    public async Task ACsvWithTheWrongNumberOfColumnsIsA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Path + "?parts=a,b,c&transform=clr", "x,y\n1,2\n");
        await response.Problem(400, "/problems/invalid-input", "/rows");
    }

    [Fact]
    public async Task PairwiseCoordinatesAreNotInverted()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"pairwise\"}", [1, 2]));
        await response.Problem(422, "/problems/invalid-option", "/transform/type");
    }

    [Fact]
    public async Task ASpanningTreeOfRatiosIsInverted()
    {
        using var client = factory.CreateClient();

        // ln(a/c) = −2l and ln(b/c) = −l of x₁ = (1, 2, 4): a tree over a, b, c (Greenacre 2020).
        using var response = await client.PostJson(Path, Request("{\"type\": \"ratios\", \"ratios\": [{\"num\": [\"a\"], \"den\": [\"c\"]}, {\"num\": [\"b\"], \"den\": [\"c\"]}]}", WorkedExample.Alr1));
        var body = await response.OkJson();
        Tolerance.Close(WorkedExample.Closed1, body.GetProperty("rows")[0]);
    }

    [Fact]
    public async Task MissingPartsAreA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"transform\": {\"type\": \"clr\"}, \"rows\": [[1, 2]]}");
        await response.Problem(400, "/problems/invalid-input", "/parts");
    }

    [Fact]
    public async Task ASinglePartIsA400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, "{\"parts\": [\"a\"], \"transform\": {\"type\": \"alr\"}, \"rows\": [[]]}");
        await response.Problem(400, "/problems/invalid-input", "/parts");
    }

    [Fact]
    public async Task AnUnknownDenominatorIsA422()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"alr\", \"denominator\": \"Cl\"}", [1, 2]));
        await response.Problem(422, "/problems/unknown-part", "/transform/denominator");
    }

    [Fact]
    public async Task ANonPositiveTotalIsA422()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"clr\"}", [1, 2, 3], ", \"total\": 0"));
        await response.Problem(422, "/problems/invalid-option", "/total");
    }

    [Fact]
    public async Task HugeCoordinatesStillGiveAComposition()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson(Path, Request("{\"type\": \"clr\"}", [1000, 0, -1000]));
        var body = await response.OkJson();

        // exp(2000) overflows a double; the inverse subtracts the largest coordinate first, so the result is (1, e⁻¹⁰⁰⁰, e⁻²⁰⁰⁰) closed.
        Tolerance.Close([1, 0, 0], body.GetProperty("rows")[0]);
    }
}
