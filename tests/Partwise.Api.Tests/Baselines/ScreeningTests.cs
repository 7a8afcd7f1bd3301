using System.Net;
using System.Text.Json;
using Partwise.Api.Baselines;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Baselines;

public class ScreeningTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private async Task<string> TinyBaseline(HttpClient client, string name, string options = "\"scatter\": \"classical\"") =>
        (await BaselineBodies.Create(client, BaselineBodies.Request(name, options))).GetProperty("id").GetString()!;

    [Theory]
    [InlineData(2.0, 2.0, 2.6)]
    [InlineData(9.0, 1.0, 1.0)]
    [InlineData(0.3, 4.0, 2.0)]
    public async Task TheDistanceEqualsAHandComputedMahalanobisDistance(double a, double b, double c)
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "hand-" + a);
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("s", a, b, c) + "}")).GetProperty("results")[0];
        var d2 = BaselineBodies.HandSquaredDistance(a, b, c);
        Tolerance.Close(d2, result.GetProperty("squaredDistance").GetDouble(), 1e-10, 1e-9, "d²");
        Tolerance.Close(Math.Sqrt(d2), result.GetProperty("distance").GetDouble(), 1e-10, 1e-9, "d");
        // χ² with 2 degrees of freedom: 1 − F(x) = e^(−x/2) (closed form).
        Tolerance.Close(Math.Exp(-d2 / 2), result.GetProperty("pValue").GetDouble(), 1e-12, 1e-8, "p-value");
        Assert.Equal(d2 > -2 * Math.Log(0.025), result.GetProperty("flagged").GetBoolean());
        Assert.Equal("s", result.GetProperty("sampleId").GetString());
        Assert.False(result.GetProperty("duplicate").GetBoolean());
    }

    [Fact]
    public async Task ReasonsArePairwiseRatiosWithHandComputedZAndExpectedRange()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "reasons");
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("r", 9, 1, 1) + "}")).GetProperty("results")[0];
        var reasons = result.GetProperty("reasons");
        Assert.Equal(3, reasons.GetArrayLength());
        // With the classical scatter in full-rank coordinates, the variance of a log-contrast a'μ under S_clr is the
        // sample variance of that log-ratio; z = (ln r − mean) / sd and expected = exp(mean ± 1.959964 sd).
        var labels = new Dictionary<string, (int, int)> { ["a/b"] = (0, 1), ["a/c"] = (0, 2), ["b/c"] = (1, 2) };
        var sample = new[] { 9.0, 1.0, 1.0 };
        var previous = double.PositiveInfinity;
        foreach (var reason in reasons.EnumerateArray())
        {
            var (i, j) = labels[reason.GetProperty("label").GetString()!];
            var (mean, sd) = BaselineBodies.LogRatioMoments(i, j);
            var value = sample[i] / sample[j];
            var z = (Math.Log(value) - mean) / sd;
            Tolerance.Close(value, reason.GetProperty("value").GetDouble(), 1e-12, 1e-12, "value");
            Tolerance.Close(z, reason.GetProperty("z").GetDouble(), 1e-9, 1e-9, "z");
            Tolerance.Close([Math.Exp(mean - (1.959963984540054 * sd)), Math.Exp(mean + (1.959963984540054 * sd))], reason.GetProperty("expected"), 1e-9, 1e-9, "expected");
            Assert.True(Math.Abs(z) <= previous);
            previous = Math.Abs(z);
        }
    }

    [Fact]
    public async Task PostingTheSameSampleAgainReturnsTheStoredResultWithDuplicateTrue()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "duplicate");
        var body = "{\"sample\": " + BaselineBodies.Sample("dup-1", 9, 1, 1) + "}";
        var first = (await BaselineBodies.Screen(client, id, body)).GetProperty("results")[0];
        var second = (await BaselineBodies.Screen(client, id, body)).GetProperty("results")[0];
        Assert.False(first.GetProperty("duplicate").GetBoolean());
        Assert.True(second.GetProperty("duplicate").GetBoolean());
        Assert.Equal(first.GetProperty("flagId").GetString(), second.GetProperty("flagId").GetString());
        Assert.NotNull(first.GetProperty("flagId").GetString());
        Assert.Equal(first.GetProperty("distance").GetDouble(), second.GetProperty("distance").GetDouble());
        Assert.True(JsonElement.DeepEquals(first.GetProperty("reasons"), second.GetProperty("reasons")));

        // The first answer (the result as computed) and the repeat (the result as stored) agree in every field but
        // the duplicate marker.
        var firstFields = System.Text.Json.Nodes.JsonNode.Parse(first.GetRawText())!.AsObject();
        var secondFields = System.Text.Json.Nodes.JsonNode.Parse(second.GetRawText())!.AsObject();
        firstFields.Remove("duplicate");
        secondFields.Remove("duplicate");
        Assert.True(System.Text.Json.Nodes.JsonNode.DeepEquals(firstFields, secondFields), $"{firstFields.ToJsonString()} != {secondFields.ToJsonString()}");
    }

    [Fact]
    public async Task TheSameIdWithOtherValuesIs409PointingAtTheSamplesIdAndStoresNothing()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "conflict");
        await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("c-1", 2, 2, 2) + "}");
        using (var single = await client.PostJson($"/v1/baselines/{id}/screenings", "{\"sample\": " + BaselineBodies.Sample("c-1", 2, 2, 3) + "}"))
        {
            await single.Problem(409, "/problems/conflict", "/sample/id");
        }

        var batch = "{\"samples\": [" + BaselineBodies.Sample("c-new", 1, 2, 2) + ", " + BaselineBodies.Sample("c-1", 5, 2, 3) + "]}";
        using (var response = await client.PostJson($"/v1/baselines/{id}/screenings", batch))
        {
            await response.Problem(409, "/problems/conflict", "/samples/1/id");
        }

        // The conflict rolled the batch back: c-new was not stored, so posting it with other values is no conflict.
        var later = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("c-new", 3, 2, 2) + "}")).GetProperty("results")[0];
        Assert.False(later.GetProperty("duplicate").GetBoolean());
    }

    [Fact]
    public async Task ABatchAnswersInOrderAndAnUnflaggedSampleHasNoFlag()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "batch");
        var body = "{\"samples\": [" + BaselineBodies.Sample("b-far", 9, 1, 1) + ", " + BaselineBodies.Sample("b-near", 2, 1.9, 2.6) + "]}";
        var results = (await BaselineBodies.Screen(client, id, body)).GetProperty("results");
        Assert.Equal(["b-far", "b-near"], results.EnumerateArray().Select(r => r.GetProperty("sampleId").GetString()));
        Assert.True(results[0].GetProperty("flagged").GetBoolean());
        Assert.False(results[1].GetProperty("flagged").GetBoolean());
        Assert.Equal(JsonValueKind.Null, results[1].GetProperty("flagId").ValueKind);
    }

    [Fact]
    public async Task AViolatedRuleFlagsASampleNearTheCentre()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "rule", "\"scatter\": \"classical\", \"rules\": [{\"ratio\": {\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"amalgamation\"}, \"max\": 1.2}]");
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("ruled", 2, 1.9, 2.6) + "}")).GetProperty("results")[0];
        Assert.True(result.GetProperty("squaredDistance").GetDouble() < -2 * Math.Log(0.025));
        Assert.True(result.GetProperty("flagged").GetBoolean());
        var violation = result.GetProperty("ruleViolations")[0];
        Assert.Equal("(a+b)/c", violation.GetProperty("label").GetString());
        Tolerance.Close((2 + 1.9) / 2.6, violation.GetProperty("value").GetDouble());
        Assert.Equal(1.2, violation.GetProperty("max").GetDouble());
    }

    [Theory]
    [InlineData("{\"sample\": {\"id\": \"m\", \"values\": {\"a\": 1, \"b\": 2}}}", "/problems/missing-part", "/sample/values/c")]
    [InlineData("{\"samples\": [{\"id\": \"m0\", \"values\": {\"a\": 1, \"b\": 2, \"c\": 3}}, {\"id\": \"m1\", \"values\": {\"a\": 1, \"c\": 2}}]}", "/problems/missing-part", "/samples/1/values/b")]
    [InlineData("{\"sample\": {\"id\": \"u\", \"values\": {\"a\": 1, \"b\": 2, \"c\": 3, \"Na\": 4}}}", "/problems/unknown-part", "/sample/values/Na")]
    [InlineData("{\"samples\": [{\"id\": \"n\", \"values\": {\"a\": 1, \"b\": -2, \"c\": 3}}]}", "/problems/negative-value", "/samples/0/values/b")]
    [InlineData("{\"sample\": {\"id\": \"z\", \"values\": {\"a\": 1, \"b\": 0, \"c\": 3}}}", "/problems/zero-value", "/sample/values/b")]
    public async Task SamplesThatCannotBeScreenedAre422AtTheValue(string body, string type, string pointer)
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "bad-" + pointer);
        using var response = await client.PostJson($"/v1/baselines/{id}/screenings", body);
        await response.Problem(422, type, pointer);
    }

    [Theory]
    [InlineData("{\"sample\": {\"id\": \"nan\", \"values\": {\"a\": NaN, \"b\": 2, \"c\": 3}}}", "/sample/values/a")]
    [InlineData("{\"sample\": {\"id\": \"str\", \"values\": {\"a\": \"1\", \"b\": 2, \"c\": 3}}}", "/sample/values/a")]
    [InlineData("{\"sample\": {\"values\": {\"a\": 1, \"b\": 2, \"c\": 3}}}", "/sample/id")]
    [InlineData("{\"sample\": {\"id\": \"v\"}}", "/sample/values")]
    [InlineData("{\"sample\": {\"id\": \"t\", \"values\": {\"a\": 1, \"b\": 2, \"c\": 3}, \"observedAt\": \"yesterday\"}}", "/sample/observedAt")]
    [InlineData("{}", "")]
    [InlineData("{\"samples\": []}", "/samples")]
    public async Task MalformedSamplesAre400(string body, string pointer)
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "malformed-" + pointer.Replace('/', '-'));
        using var response = await client.PostJson($"/v1/baselines/{id}/screenings", body);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task SampleAndSamplesTogetherIs400()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "both");
        using var response = await client.PostJson($"/v1/baselines/{id}/screenings", "{\"sample\": " + BaselineBodies.Sample("x", 1, 2, 3) + ", \"samples\": [" + BaselineBodies.Sample("y", 1, 2, 3) + "]}");
        await response.Problem(400, "/problems/invalid-input", "/samples");
    }

    [Fact]
    public async Task AZeroIsReplacedByTheBaselinesPolicyWithTheSamplesOwnSum()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "zeros", "\"scatter\": \"classical\", \"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": {\"b\": 0.2}, \"fraction\": 0.5}");
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("zero-b", 2, 0, 3) + "}")).GetProperty("results")[0];
        // Multiplicative replacement (Martín-Fernández et al. 2003): b becomes 0.5 × 0.2 = 0.1, and a, c are scaled by
        // (1 − 0.1 / 5) with the sample's own sum c = 5, so a/c is unchanged and d² is that of (1.96, 0.1, 2.94).
        var imputed = result.GetProperty("imputed")[0];
        Assert.Equal("b", imputed.GetProperty("part").GetString());
        Tolerance.Close(0.1, imputed.GetProperty("value").GetDouble());
        var scale = 1 - (0.1 / 5);
        Tolerance.Close(BaselineBodies.HandSquaredDistance(2 * scale, 0.1, 3 * scale), result.GetProperty("squaredDistance").GetDouble(), 1e-10, 1e-9);
    }

    [Fact]
    public async Task ABatchOverTheLimitIs413()
    {
        await using var small = PartwiseFactory.WithLimits(("MaxScreeningSamples", "2"));
        using var client = small.CreateClient();
        var id = (await BaselineBodies.Create(client, BaselineBodies.Request("limit"))).GetProperty("id").GetString();
        var body = "{\"samples\": [" + string.Join(", ", Enumerable.Range(0, 3).Select(i => BaselineBodies.Sample("l" + i, 1, 2, 3))) + "]}";
        using var response = await client.PostJson($"/v1/baselines/{id}/screenings", body);
        await response.Problem(413, "/problems/too-large", "/samples");
        using var inline = await client.PostJson("/v1/screenings", "{\"baseline\": {}, \"samples\": []}");
        Assert.Equal(400, (int)inline.StatusCode);
    }

    [Fact]
    public async Task ScreeningTakesJsonOnly()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "media");
        using var response = await client.PostCsv($"/v1/baselines/{id}/screenings", "a,b,c\n1,2,3\n");
        await response.Problem(415, "/problems/unsupported-media-type");
    }

    [Fact]
    public async Task InlineScreeningWithTheStoredDocumentGivesTheStoredResults()
    {
        using var client = factory.CreateClient();
        // The demo well-11 baseline (robust scatter, multiplicative zeros, a rule) and its drifting 2026 samples.
        var created = await BaselineBodies.Create(client, DemoBaseline.RequestBody().Replace("\"name\": \"well-11 2025\"", "\"name\": \"inline-check\"", StringComparison.Ordinal));
        var id = created.GetProperty("id").GetString();
        var samples = await File.ReadAllTextAsync(Path.Combine(Path.GetDirectoryName(OpenApiTests.CommittedPath())!, "..", "demo", "well-11-screenings.json"));
        var stored = (await BaselineBodies.Screen(client, id!, samples)).GetProperty("results");
        using var get = await client.GetAsync(new Uri($"/v1/baselines/{id}", UriKind.Relative));
        var document = (await get.OkJson()).GetRawText();
        var inlineBody = "{\"baseline\": " + document + ", " + samples.Trim()[1..];
        using var inline = await client.PostJson("/v1/screenings", inlineBody);
        var results = (await inline.OkJson()).GetProperty("results");
        Assert.Equal(stored.GetArrayLength(), results.GetArrayLength());
        for (var i = 0; i < results.GetArrayLength(); i++)
        {
            foreach (var field in new[] { "sampleId", "distance", "squaredDistance", "pValue", "flagged", "reasons", "ruleViolations", "imputed" })
            {
                Assert.True(JsonElement.DeepEquals(stored[i].GetProperty(field), results[i].GetProperty(field)), $"result {i}: {field} differs");
            }

            Assert.Equal(JsonValueKind.Null, results[i].GetProperty("flagId").ValueKind);
            Assert.False(results[i].GetProperty("duplicate").GetBoolean());
        }

        Assert.Contains(results.EnumerateArray(), r => r.GetProperty("flagged").GetBoolean());
    }

    [Theory]
    [InlineData("location", "null", 400, "/problems/invalid-input", "/baseline/location")]
    [InlineData("location", "[1, 2, 3]", 400, "/problems/invalid-input", "/baseline/location")]
    [InlineData("location", "[1e300, -1e300]", 422, "/problems/non-finite-value", "/sample/values")]
    [InlineData("covariance", "[[1, 0], [0, -1]]", 422, "/problems/singular-scatter", "/baseline/covariance")]
    [InlineData("covariance", "[[1, 0.5], [0.2, 1]]", 400, "/problems/invalid-input", "/baseline/covariance/1/0")]
    [InlineData("cutoff", "1.5", 422, "/problems/invalid-option", "/baseline/cutoff")]
    [InlineData("scatter", "\"median\"", 400, "/problems/invalid-input", "/baseline/scatter")]
    [InlineData("basis", "[[1, 0], [0, 1], [0, 0]]", 400, "/problems/invalid-input", "/baseline/basis")]
    [InlineData("basis", "[[1, 0], [0, 1]]", 400, "/problems/invalid-input", "/baseline/basis")]
    [InlineData("basis", "[[1, 0], null, [0, 0]]", 400, "/problems/invalid-input", "/baseline/basis")]
    [InlineData("covariance", "[null, [0, 1]]", 400, "/problems/invalid-input", "/baseline/covariance")]
    [InlineData("parts", "[\"a\", \"a\", \"c\"]", 400, "/problems/invalid-input", "/baseline/parts/1")]
    [InlineData("threshold", "3", 400, "/problems/invalid-input", "/baseline/threshold")]
    [InlineData("degreesOfFreedom", "3", 400, "/problems/invalid-input", "/baseline/degreesOfFreedom")]
    [InlineData("zeros", "{\"method\": \"guess\"}", 400, "/problems/invalid-input", "/baseline/zeros/method")]
    [InlineData("rules", "[{\"ratio\": {\"num\": [\"a\"], \"den\": [\"K\"]}, \"max\": 1}]", 422, "/problems/unknown-part", "/baseline/rules/0/ratio/den/0")]
    [InlineData("coordinates", "{\"type\": \"clr\"}", 400, "/problems/invalid-input", "/baseline/coordinates/type")]
    public async Task EveryFieldOfAnInlineDocumentIsChecked(string field, string value, int status, string type, string pointer)
    {
        using var client = factory.CreateClient();
        var created = await BaselineBodies.Create(client, BaselineBodies.Request("inline-" + field + value.Length));
        var document = System.Text.Json.Nodes.JsonNode.Parse(created.GetRawText())!.AsObject();
        document[field] = System.Text.Json.Nodes.JsonNode.Parse(value);
        using var response = await client.PostJson("/v1/screenings", "{\"baseline\": " + document.ToJsonString() + ", \"sample\": " + BaselineBodies.Sample("i", 1, 2, 3) + "}");
        await response.Problem(status, type, pointer);
    }

    [Fact]
    public async Task ExtremeButPositiveValuesScreenOrAre422NeverA500()
    {
        // 1e-300 is tiny but a/c = 2e300 is still a double: screened and flagged by the rule a/c ≤ 0.5. With 1e-320
        // (subnormal) ln a − ln c ≈ 737 is finite but a/c overflows: the ratio cannot be written, so a 422 at the values.
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "subnormal", "\"scatter\": \"classical\", \"rules\": [{\"ratio\": {\"num\": [\"a\"], \"den\": [\"c\"]}, \"max\": 0.5}]");
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("tiny-1", 2, 2, 1e-300) + "}")).GetProperty("results")[0];
        Assert.True(result.GetProperty("flagged").GetBoolean());
        Assert.True(double.IsFinite(result.GetProperty("distance").GetDouble()));
        using var response = await client.PostJson($"/v1/baselines/{id}/screenings", "{\"sample\": " + BaselineBodies.Sample("sub-1", 2, 2, 1e-320) + "}");
        await response.Problem(422, "/problems/non-finite-value", "/sample/values");
    }

    [Fact]
    public async Task AnInlineRequestWithoutABaselineIs400()
    {
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/screenings", "{\"sample\": " + BaselineBodies.Sample("i", 1, 2, 3) + "}");
        await response.Problem(400, "/problems/invalid-input", "/baseline");
    }

    [Fact]
    public async Task TheCompletionEventCarriesCountsNotValues()
    {
        using var client = factory.CreateClient();
        var id = await TinyBaseline(client, "logged");
        await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("log-1", 9.25, 1, 1) + "}");
        var completion = factory.Logs.Events.Last(e => e.Properties.TryGetValue("Route", out var r) && r.ToString().Contains("screenings", StringComparison.Ordinal));
        Assert.Equal("1", completion.Properties["SampleCount"].ToString());
        Assert.DoesNotContain("9.25", completion.RenderMessage(), StringComparison.Ordinal);
        Assert.Equal(HttpStatusCode.OK.ToString("D"), completion.Properties["StatusCode"].ToString());
    }
}
