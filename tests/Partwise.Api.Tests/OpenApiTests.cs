using System.Text.Json;
using System.Text.Json.Nodes;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests;

public class OpenApiTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private static readonly string[] ProblemStatuses = ["400", "413", "415", "422"];

    // The routes that take a request body without a table: JSON only, so no CSV example.
    private static readonly string[] JsonOnly = ["/v1/baselines/{id}/screenings", "/v1/screenings", "/v1/flags/{id}/review"];

    private async Task<JsonNode> Served()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/openapi/v1.json", UriKind.Relative));
        response.EnsureSuccessStatusCode();
        return JsonNode.Parse(await response.Content.ReadAsStringAsync())!;
    }

    /// <summary>The committed contract, found by walking up from the test binaries to the repository root.</summary>
    public static string CommittedPath()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "service.sln")))
            {
                return Path.Combine(dir.FullName, "openapi", "partwise.v1.json");
            }
        }

        throw new InvalidOperationException("The repository root (service.sln) was not found above " + AppContext.BaseDirectory);
    }

    [Fact]
    public async Task TheServedDocumentEqualsTheCommittedContract()
    {
        var served = await Served();
        var committed = JsonNode.Parse(await File.ReadAllTextAsync(CommittedPath()))!;

        // Parsed and compared as JSON, so indentation and member order do not matter; any other change does.
        if (!JsonNode.DeepEquals(served, committed))
        {
            Assert.Fail("The served OpenAPI document differs from openapi/partwise.v1.json. Build src/Partwise.Api to regenerate it and review the diff. First difference: " + FirstDifference(committed, served, ""));
        }
    }

    [Fact]
    public async Task TheDocumentIsOpenApi31WithTheCautionInItsDescription()
    {
        var doc = await Served();
        Assert.StartsWith("3.1", doc["openapi"]!.GetValue<string>(), StringComparison.Ordinal);
        Assert.Contains("qualified analyst", doc["info"]!["description"]!.GetValue<string>(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task TheRoutesAreExactlyTheContractsRoutesAndOperations()
    {
        var doc = await Served();
        var routes = doc["paths"]!.AsObject().SelectMany(p => p.Value!.AsObject().Select(m => $"{m.Key.ToUpperInvariant()} {p.Key}")).Order(StringComparer.Ordinal).ToArray();
        Assert.Equal(
            [
                "DELETE /v1/baselines/{id}",
                "GET /healthz",
                "GET /readyz",
                "GET /v1/baselines",
                "GET /v1/baselines/{id}",
                "GET /v1/baselines/{id}/biplot",
                "GET /v1/flags",
                "POST /v1/baselines",
                "POST /v1/baselines/{id}/screenings",
                "POST /v1/compositions/prepare",
                "POST /v1/coordinates",
                "POST /v1/coordinates/inverse",
                "POST /v1/distances",
                "POST /v1/flags/{id}/review",
                "POST /v1/lra",
                "POST /v1/ratio-selection",
                "POST /v1/ratio-sets/evaluate",
                "POST /v1/ratio-sets/reconstruct",
                "POST /v1/screenings",
                "POST /v1/summary",
            ],
            routes);
    }

    [Fact]
    public async Task EveryOperationHasATagANameASummaryAndADescription()
    {
        var doc = await Served();
        foreach (var (path, item) in doc["paths"]!.AsObject())
        {
            foreach (var (method, operation) in item!.AsObject())
            {
                var what = $"{method} {path}";
                Assert.True(operation!["tags"]?.AsArray().Count > 0, what + " has no tag");
                Assert.False(string.IsNullOrWhiteSpace(operation["operationId"]?.GetValue<string>()), what + " has no name");
                Assert.False(string.IsNullOrWhiteSpace(operation["summary"]?.GetValue<string>()), what + " has no summary");
                Assert.False(string.IsNullOrWhiteSpace(operation["description"]?.GetValue<string>()), what + " has no description");
            }
        }
    }

    [Fact]
    public async Task EveryPostDeclaresItsExamplesAndEveryProblemResponse()
    {
        var doc = await Served();
        foreach (var (path, item) in doc["paths"]!.AsObject())
        {
            if (item!["post"] is not { } operation)
            {
                continue;
            }

            var content = operation["requestBody"]!["content"]!;
            Assert.NotNull(content["application/json"]!["example"]);
            Assert.NotNull(content["application/json"]!["schema"]);
            if (!JsonOnly.Contains(path))
            {
                Assert.False(string.IsNullOrEmpty(content["text/csv"]!["example"]!.GetValue<string>()), path + " has no CSV example");
            }

            foreach (var status in path == "/v1/flags/{id}/review" ? ["400", "413", "415"] : ProblemStatuses)
            {
                var schema = operation["responses"]![status]?["content"]?["application/problem+json"]?["schema"]?["$ref"]?.GetValue<string>();
                Assert.True(schema == "#/components/schemas/ProblemDetails", $"{path} does not declare {status} as a problem document");
            }
        }
    }

    [Fact]
    public async Task TheProblemSchemaDescribesTheErrorsList()
    {
        var doc = await Served();
        var errors = doc["components"]!["schemas"]!["ProblemDetails"]!["properties"]!["errors"]!;
        Assert.Equal("array", errors["type"]!.GetValue<string>());
        Assert.NotNull(errors["items"]!["properties"]!["pointer"]);
    }

    [Fact]
    public async Task EveryDocumentedExampleIsAnswered()
    {
        var doc = await Served();
        using var client = factory.CreateClient();
        var paths = doc["paths"]!.AsObject();
        // The stored routes' examples run in order: the baseline example, a screening of its example sample (which
        // the baseline flags), then a review of that flag.
        string? baselineId = null, flagId = null;
        foreach (var path in new[] { "/v1/baselines", "/v1/baselines/{id}/screenings", "/v1/flags/{id}/review" }.Concat(paths.Select(p => p.Key)).Distinct())
        {
            if (paths[path]!["post"] is not { } operation)
            {
                continue;
            }

            var content = operation["requestBody"]!["content"]!;
            var json = content["application/json"]!["example"]!.ToJsonString();
            var target = path.Replace("{id}", path.StartsWith("/v1/flags", StringComparison.Ordinal) ? flagId : baselineId, StringComparison.Ordinal);
            using (var response = await client.PostJson(target, json))
            {
                var text = await response.Content.ReadAsStringAsync();
                Assert.True(response.IsSuccessStatusCode, $"{path}: {(int)response.StatusCode} {text}");
                using var answer = JsonDocument.Parse(text);
                if (path == "/v1/baselines")
                {
                    baselineId = answer.RootElement.GetProperty("id").GetString();
                }
                else if (path == "/v1/baselines/{id}/screenings")
                {
                    flagId = answer.RootElement.GetProperty("results")[0].GetProperty("flagId").GetString();
                    Assert.NotNull(flagId);
                }
            }

            if (JsonOnly.Contains(path))
            {
                continue;
            }

            // The CSV example with the query options of the JSON example's kind: the simplest that fits each route.
            var query = path switch
            {
                "/v1/coordinates" => "?transform=alr&denominator=Cl&zeros=multiplicative&detectionLimit.NO3=0.05",
                "/v1/coordinates/inverse" => "?transform=alr&parts=Ca,Mg,Na,Cl",
                "/v1/baselines" => "?name=from-csv&zeros=multiplicative&detectionLimit=0.5",
                "/v1/ratio-sets/evaluate" => "?zeros=multiplicative&detectionLimit=0.05&ratio=Na/Cl&ratio=Ca/HCO3",
                "/v1/ratio-sets/reconstruct" => "?parts=Ca,Mg,Na,Cl&ratio=Ca/Cl&ratio=Mg/Cl&ratio=Na/Cl",
                _ => "?zeros=multiplicative&detectionLimit=0.05",
            };
            using (var response = await client.PostCsv(path + query, content["text/csv"]!["example"]!.GetValue<string>()))
            {
                Assert.True(response.IsSuccessStatusCode, $"{path} (CSV): {(int)response.StatusCode} {await response.Content.ReadAsStringAsync()}");
            }
        }
    }

    [Fact]
    public async Task ThePictureRoutesDeclareSvgAndNoOtherDoes()
    {
        var doc = await Served();
        foreach (var (path, item) in doc["paths"]!.AsObject())
        {
            foreach (var (_, operation) in item!.AsObject())
            {
                var svg = operation!["responses"]?["200"]?["content"]?["image/svg+xml"];
                Assert.True((svg is not null) == (path is "/v1/lra" or "/v1/ratio-selection"), path + (svg is null ? " lacks" : " declares") + " image/svg+xml");
            }
        }
    }

    [Fact]
    public async Task UnknownMembersAreAllowedInRequestSchemas()
    {
        var doc = await Served();
        var request = doc["components"]!["schemas"]!["CoordinatesRequest"]!.AsObject();
        Assert.False(request.TryGetPropertyValue("additionalProperties", out var additional) && additional?.GetValueKind() == JsonValueKind.False);
        Assert.Contains("parts", request["required"]!.AsArray().Select(r => r!.GetValue<string>()));
    }

    private static string FirstDifference(JsonNode? expected, JsonNode? actual, string at)
    {
        if (expected is JsonObject eo && actual is JsonObject ao)
        {
            foreach (var key in eo.Select(p => p.Key).Union(ao.Select(p => p.Key)))
            {
                if (!JsonNode.DeepEquals(eo[key], ao[key]))
                {
                    return FirstDifference(eo[key], ao[key], at + "/" + key);
                }
            }
        }
        else if (expected is JsonArray ea && actual is JsonArray aa && ea.Count == aa.Count)
        {
            for (var i = 0; i < ea.Count; i++)
            {
                if (!JsonNode.DeepEquals(ea[i], aa[i]))
                {
                    return FirstDifference(ea[i], aa[i], at + "/" + i);
                }
            }
        }

        return $"{at}: committed {expected?.ToJsonString() ?? "absent"}, served {actual?.ToJsonString() ?? "absent"}";
    }
}
