using System.Net;
using System.Text.Json;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Baselines;

public class BaselineTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    [Fact]
    public async Task CreatingABaselineAnswers201WithLocationAndTheDocument()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("created", "\"scatter\": \"classical\", \"description\": \"three parts\""));
        Assert.Equal(HttpStatusCode.Created, response.StatusCode);
        var doc = JsonDocument.Parse(await response.Content.ReadAsStringAsync()).RootElement;
        var id = doc.GetProperty("id").GetString()!;
        Assert.Equal($"/v1/baselines/{id}", response.Headers.Location?.OriginalString);
        Assert.Equal("created", doc.GetProperty("name").GetString());
        Assert.Equal(1, doc.GetProperty("version").GetInt32());
        Assert.Equal("three parts", doc.GetProperty("description").GetString());
        Assert.Equal(["a", "b", "c"], doc.GetProperty("parts").EnumerateArray().Select(p => p.GetString()));
        Assert.Equal("ilr", doc.GetProperty("coordinates").GetProperty("type").GetString());
        Assert.Equal(JsonValueKind.Null, doc.GetProperty("ratios").ValueKind);
        Assert.Equal(JsonValueKind.Null, doc.GetProperty("explained").ValueKind);
        Assert.Equal(JsonValueKind.Null, doc.GetProperty("retiredAt").ValueKind);
        Assert.Equal(3, doc.GetProperty("basis").GetArrayLength());
        Assert.Equal(2, doc.GetProperty("basis")[0].GetArrayLength());
        Assert.Equal("reject", doc.GetProperty("zeros").GetProperty("method").GetString());
        Assert.Equal("classical", doc.GetProperty("scatter").GetString());
        Assert.Equal(0.975, doc.GetProperty("cutoff").GetDouble());
        Assert.Equal(2, doc.GetProperty("degreesOfFreedom").GetInt32());
        Assert.Equal(8, doc.GetProperty("referenceCount").GetInt32());
        Assert.True(doc.GetProperty("referenceFlagged").GetInt32() >= 0);
        // χ² with 2 degrees of freedom: F(x) = 1 − e^(−x/2), so the 0.975 quantile is −2 ln 0.025 (closed form).
        Tolerance.Close(-2 * Math.Log(0.025), doc.GetProperty("threshold").GetDouble(), 1e-9, 1e-9, "threshold");
        Assert.Equal(2, doc.GetProperty("location").GetArrayLength());
        Assert.Equal(2, doc.GetProperty("covariance").GetArrayLength());
    }

    [Fact]
    public async Task TheClassicalCovarianceEqualsTheSampleCovarianceOfThePivotCoordinates()
    {
        using var client = factory.CreateClient();
        var doc = await BaselineBodies.Create(client, BaselineBodies.Request("pivot-moments"));
        // Pivot coordinates by hand (Fišerová & Hron 2011): z1 = √(2/3) ln(a / √(bc)), z2 = √(1/2) ln(b / c).
        var z = BaselineBodies.Rows.Select(r => new[] { Math.Sqrt(2.0 / 3) * Math.Log(r[0] / Math.Sqrt(r[1] * r[2])), Math.Sqrt(0.5) * Math.Log(r[1] / r[2]) }).ToArray();
        var mean = new[] { z.Average(v => v[0]), z.Average(v => v[1]) };
        Tolerance.Close(mean, doc.GetProperty("location"), 1e-12, 1e-10, "location");
        var n = z.Length;
        var cov = new double[2][];
        for (var r = 0; r < 2; r++)
        {
            cov[r] = new double[2];
            for (var c = 0; c < 2; c++)
            {
                cov[r][c] = z.Sum(v => (v[r] - mean[r]) * (v[c] - mean[c])) / (n - 1);
            }
        }

        Tolerance.Close(cov, doc.GetProperty("covariance"), 1e-12, 1e-10, "covariance");
    }

    [Fact]
    public async Task ARefitUnderTheSameNameGetsTheNextVersion()
    {
        using var client = factory.CreateClient();
        var first = await BaselineBodies.Create(client, BaselineBodies.Request("refit"));
        var second = await BaselineBodies.Create(client, BaselineBodies.Request("refit", "\"scatter\": \"robust\""));
        Assert.Equal(1, first.GetProperty("version").GetInt32());
        Assert.Equal(2, second.GetProperty("version").GetInt32());
        Assert.NotEqual(first.GetProperty("id").GetString(), second.GetProperty("id").GetString());
        Assert.Equal("robust", second.GetProperty("scatter").GetString());
    }

    [Fact]
    public async Task GetReturnsTheDocumentAsCreated()
    {
        using var client = factory.CreateClient();
        var created = await BaselineBodies.Create(client, BaselineBodies.Request("read-back"));
        var id = created.GetProperty("id").GetString();
        using var response = await client.GetAsync(new Uri($"/v1/baselines/{id}", UriKind.Relative));
        var got = await response.OkJson();
        Assert.True(JsonElement.DeepEquals(created, got), "GET differs from the created document");
    }

    [Fact]
    public async Task AnUnknownBaselineIs404()
    {
        using var client = factory.CreateClient();
        using var get = await client.GetAsync(new Uri("/v1/baselines/no-such-id", UriKind.Relative));
        await get.Problem(404, "/problems/not-found");
        using var delete = await client.DeleteAsync(new Uri("/v1/baselines/no-such-id", UriKind.Relative));
        await delete.Problem(404, "/problems/not-found");
        using var screen = await client.PostJson("/v1/baselines/no-such-id/screenings", "{\"sample\": " + BaselineBodies.Sample("s1", 1, 2, 3) + "}");
        await screen.Problem(404, "/problems/not-found");
    }

    [Fact]
    public async Task RetiringAnswers204ThenScreeningIs410AndTheDocumentIsStillReadMarkedRetired()
    {
        using var client = factory.CreateClient();
        var id = (await BaselineBodies.Create(client, BaselineBodies.Request("to-retire"))).GetProperty("id").GetString();
        // Screen once first, so that the rebuilt baseline is cached: retirement must still be seen.
        await BaselineBodies.Screen(client, id!, "{\"sample\": " + BaselineBodies.Sample("before", 2, 2, 2.5) + "}");
        using (var delete = await client.DeleteAsync(new Uri($"/v1/baselines/{id}", UriKind.Relative)))
        {
            Assert.Equal(HttpStatusCode.NoContent, delete.StatusCode);
        }

        using (var again = await client.DeleteAsync(new Uri($"/v1/baselines/{id}", UriKind.Relative)))
        {
            Assert.Equal(HttpStatusCode.NoContent, again.StatusCode);
        }

        using (var screen = await client.PostJson($"/v1/baselines/{id}/screenings", "{\"sample\": " + BaselineBodies.Sample("after", 2, 2, 2.5) + "}"))
        {
            await screen.Problem(410, "/problems/baseline-retired");
        }

        using var get = await client.GetAsync(new Uri($"/v1/baselines/{id}", UriKind.Relative));
        var doc = await get.OkJson();
        Assert.Equal(JsonValueKind.String, doc.GetProperty("retiredAt").ValueKind);

        using var active = await client.GetAsync(new Uri("/v1/baselines?active=true", UriKind.Relative));
        Assert.DoesNotContain(id, (await active.OkJson()).GetProperty("items").EnumerateArray().Select(b => b.GetProperty("id").GetString()));
        using var all = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
        Assert.Contains(id, (await all.OkJson()).GetProperty("items").EnumerateArray().Select(b => b.GetProperty("id").GetString()));
    }

    [Fact]
    public async Task TheListHasTheMostRecentFirst()
    {
        using var client = factory.CreateClient();
        var older = (await BaselineBodies.Create(client, BaselineBodies.Request("list-older"))).GetProperty("id").GetString();
        var newer = (await BaselineBodies.Create(client, BaselineBodies.Request("list-newer"))).GetProperty("id").GetString();
        using var response = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
        var ids = (await response.OkJson()).GetProperty("items").EnumerateArray().Select(b => b.GetProperty("id").GetString()).ToList();
        Assert.True(ids.IndexOf(newer) < ids.IndexOf(older));
        using var bad = await client.GetAsync(new Uri("/v1/baselines?active=maybe", UriKind.Relative));
        await bad.Problem(400, "/problems/invalid-input", "/active");
    }

    [Fact]
    public async Task FewerReferenceSamplesThanCoordinatesPlusOneIs422()
    {
        using var client = factory.CreateClient();
        // Three parts give p = 2 coordinates, so at least 3 samples are needed; 2 are sent.
        using var response = await client.PostJson("/v1/baselines", "{\"name\": \"few\", \"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3], [2, 1, 3]], \"scatter\": \"classical\"}");
        await response.Problem(422, "/problems/too-few-samples", "/rows");
    }

    [Theory]
    [InlineData("classical")]
    [InlineData("robust")]
    public async Task AConstantRatioGivesASingularScatter(string scatter)
    {
        using var client = factory.CreateClient();
        // b = 2a in every sample, so ln(b/a) is constant and the scatter of the coordinates has rank 1.
        using var response = await client.PostJson("/v1/baselines", "{\"name\": \"constant\", \"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3], [2, 4, 3], [3, 6, 2], [1.5, 3, 4], [2.5, 5, 1], [4, 8, 3]], \"scatter\": \"" + scatter + "\"}");
        await response.Problem(422, "/problems/singular-scatter");
    }

    [Fact]
    public async Task RulesOnUnknownPartsAre422PointingAtThePart()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("bad-rule", "\"rules\": [{\"ratio\": {\"num\": [\"a\"], \"den\": [\"Zn\"]}, \"max\": 2}]"));
        await response.Problem(422, "/problems/unknown-part", "/rules/0/ratio/den/0");
    }

    [Fact]
    public async Task ARuleWithNeitherLimitIs422()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("no-limit", "\"rules\": [{\"ratio\": {\"num\": [\"a\"], \"den\": [\"b\"]}}]"));
        await response.Problem(422, "/problems/invalid-option", "/rules/0");
    }

    [Theory]
    [InlineData("0")]
    [InlineData("1")]
    [InlineData("1.5")]
    [InlineData("-0.1")]
    public async Task ACutoffOutsideTheOpenUnitIntervalIs422(string cutoff)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("cutoff", "\"cutoff\": " + cutoff));
        await response.Problem(422, "/problems/invalid-option", "/cutoff");
    }

    [Fact]
    public async Task AnAmalgamationAsACoordinateIs422PointingAtTheRatio()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("amalgamation", "\"coordinates\": {\"type\": \"ratios\", \"ratios\": [{\"num\": [\"a\"], \"den\": [\"c\"]}, {\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"amalgamation\"}]}"));
        await response.Problem(422, "/problems/invalid-ratio", "/coordinates/ratios/1");
    }

    [Fact]
    public async Task RatioCoordinatesKeepTheirRatiosAndHaveNoBasis()
    {
        using var client = factory.CreateClient();
        var doc = await BaselineBodies.Create(client, BaselineBodies.Request("ratios", "\"scatter\": \"classical\", \"coordinates\": {\"type\": \"ratios\", \"ratios\": [{\"num\": [\"a\"], \"den\": [\"c\"]}, {\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"balance\"}]}"));
        Assert.Equal("ratios", doc.GetProperty("coordinates").GetProperty("type").GetString());
        Assert.Equal(JsonValueKind.Null, doc.GetProperty("basis").ValueKind);
        Assert.Equal(2, doc.GetProperty("ratios").GetArrayLength());
        Assert.Equal("balance", doc.GetProperty("ratios")[1].GetProperty("kind").GetString());
    }

    [Fact]
    public async Task DependentRatioCoordinatesAre422()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("dependent", "\"coordinates\": {\"type\": \"ratios\", \"ratios\": [{\"num\": [\"a\"], \"den\": [\"c\"]}, {\"num\": [\"c\"], \"den\": [\"a\"]}]}"));
        await response.Problem(422, "/problems/singular-ratio-set", "/coordinates/ratios");
    }

    [Fact]
    public async Task SelectionCoordinatesAreTheChosenPairwiseRatiosWithTheFractionExplained()
    {
        using var client = factory.CreateClient();
        var full = await BaselineBodies.Create(client, BaselineBodies.Request("selection-full", "\"scatter\": \"classical\", \"coordinates\": {\"type\": \"selection\"}"));
        Assert.Equal("selection", full.GetProperty("coordinates").GetProperty("type").GetString());
        Assert.Equal(2, full.GetProperty("ratios").GetArrayLength());
        Assert.All(full.GetProperty("ratios").EnumerateArray(), r => Assert.Equal("pairwise", r.GetProperty("kind").GetString()));
        Assert.Equal(JsonValueKind.Null, full.GetProperty("basis").ValueKind);
        // J − 1 pairwise ratios forming a tree explain all of the log-ratio variance (Greenacre 2019).
        Tolerance.Close(1.0, full.GetProperty("explained").GetDouble(), 1e-9, 1e-9, "explained");
        // Full-rank coordinates: the distance is the hand-computed one in alr coordinates (Filzmoser & Hron 2008).
        var id = full.GetProperty("id").GetString()!;
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("sel", 9, 1, 1) + "}")).GetProperty("results")[0];
        Tolerance.Close(BaselineBodies.HandSquaredDistance(9, 1, 1), result.GetProperty("squaredDistance").GetDouble(), 1e-10, 1e-9);

        var one = await BaselineBodies.Create(client, BaselineBodies.Request("selection-one", "\"scatter\": \"classical\", \"coordinates\": {\"type\": \"selection\", \"maxRatios\": 1}"));
        Assert.Equal(1, one.GetProperty("ratios").GetArrayLength());
        Assert.Equal(1, one.GetProperty("degreesOfFreedom").GetInt32());
        var explained = one.GetProperty("explained").GetDouble();
        Assert.True(explained is > 0 and < 1, $"explained {explained}");
    }

    [Fact]
    public async Task ASelectionBaselineRefusesAmalgamationsAsCandidates()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("selection-amalgamations", "\"coordinates\": {\"type\": \"selection\", \"amalgamations\": {\"ab\": [\"a\", \"b\"]}}"));
        await response.Problem(422, "/problems/invalid-option", "/coordinates/amalgamations");
    }

    [Fact]
    public async Task ASelectionStopOutOfRangeIs422AtTheOption()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", BaselineBodies.Request("selection-stop", "\"coordinates\": {\"type\": \"selection\", \"explained\": 1.5}"));
        await response.Problem(422, "/problems/invalid-option", "/coordinates/explained");
    }

    [Theory]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2], [2, 1], [3, 1]]}", "/name")]
    [InlineData("{\"name\": \"x\", \"parts\": [\"a\", \"b\"], \"rows\": [[1, 2], [2, 1], [3, 1]], \"scatter\": \"median\"}", "/scatter")]
    [InlineData("{\"name\": \"x\", \"parts\": [\"a\", \"b\"], \"rows\": [[1, 2], [2, 1], [3, 1]], \"coordinates\": {\"type\": \"clr\"}}", "/coordinates/type")]
    [InlineData("{\"name\": \"x\", \"parts\": [\"a\", \"b\"], \"rows\": [[1, 2], [2, 1], [3, 1]], \"cutoff\": \"high\"}", "/cutoff")]
    public async Task MalformedBaselineRequestsAre400(string body, string pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", body);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task AZeroInTheReferenceUnderRejectIs422AtItsCell()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/baselines", "{\"name\": \"zero\", \"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3], [2, 0, 3], [3, 1, 2], [1, 1, 1]]}");
        await response.Problem(422, "/problems/zero-value", "/rows/1/1");
    }

    [Fact]
    public async Task ABaselineAlsoComesAsCsv()
    {
        using var client = factory.CreateClient();
        var csv = "a,b,c\n" + string.Join("\n", BaselineBodies.Rows.Select(r => string.Join(",", r.Select(v => v.ToString("R", System.Globalization.CultureInfo.InvariantCulture))))) + "\n";
        using var response = await client.PostCsv("/v1/baselines?name=from-csv&scatter=classical&cutoff=0.99", csv);
        Assert.Equal(HttpStatusCode.Created, response.StatusCode);
        var doc = JsonDocument.Parse(await response.Content.ReadAsStringAsync()).RootElement;
        Assert.Equal("from-csv", doc.GetProperty("name").GetString());
        Assert.Equal(0.99, doc.GetProperty("cutoff").GetDouble());
        // χ²₂ quantile −2 ln(1 − q) (closed form).
        Tolerance.Close(-2 * Math.Log(0.01), doc.GetProperty("threshold").GetDouble(), 1e-9, 1e-9);
    }

    [Fact]
    public async Task NamedAmalgamationsGiveNamedRatiosWithTheirOwnLocationAndScale()
    {
        using var client = factory.CreateClient();
        var doc = await BaselineBodies.Create(client, BaselineBodies.Request("named", "\"scatter\": \"classical\", \"amalgamations\": {\"ab\": [\"a\", \"b\"], \"cc\": [\"c\"]}"));
        var named = doc.GetProperty("namedRatios");
        Assert.Equal(1, named.GetArrayLength());
        Assert.Equal("ab/cc", named[0].GetProperty("label").GetString());
        // Classical: mean and standard deviation (n − 1) of ln((a + b) / c) over the reference rows.
        var v = BaselineBodies.Rows.Select(r => Math.Log((r[0] + r[1]) / r[2])).ToArray();
        var mean = v.Average();
        Tolerance.Close(mean, named[0].GetProperty("location").GetDouble(), 1e-12, 1e-10);
        var scale = Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / (v.Length - 1));
        Tolerance.Close(scale, named[0].GetProperty("scale").GetDouble(), 1e-12, 1e-10);

        // A sample far out in (a + b) / c: the named ratio is a reason, with z = (ln r − mean) / sd, stored or inline.
        var id = doc.GetProperty("id").GetString()!;
        var body = "\"sample\": " + BaselineBodies.Sample("named-far", 6, 6, 0.5);
        var stored = (await BaselineBodies.Screen(client, id, "{" + body + "}")).GetProperty("results")[0];
        var reason = Assert.Single(stored.GetProperty("reasons").EnumerateArray(), r => r.GetProperty("label").GetString() == "ab/cc");
        Tolerance.Close((Math.Log(12 / 0.5) - mean) / scale, reason.GetProperty("z").GetDouble(), 1e-9, 1e-9, "z");
        using var inline = await client.PostJson("/v1/screenings", "{\"baseline\": " + doc.GetRawText() + ", " + body + "}");
        Assert.True(JsonElement.DeepEquals(stored.GetProperty("reasons"), (await inline.OkJson()).GetProperty("results")[0].GetProperty("reasons")));
    }
}
