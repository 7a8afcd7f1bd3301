using System.Collections.Concurrent;
using System.Net;
using System.Net.Http.Headers;
using System.Text.Json;
using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.DependencyInjection;
using Partwise.Api.Tests.Support;
using Xunit.Abstractions;

namespace Partwise.Api.Tests.Hostile;

/// <summary>
/// No caller input produces a 5xx: several thousand seeded hostile requests over every route the app maps (read
/// from its endpoint data source, so a new route is covered without editing this file), each answered with a 2xx,
/// a 304 or a 4xx problem document; afterwards the service still answers /healthz and every route's valid request.
/// The host has small limits so that requests at and over them stay quick.
/// </summary>
public sealed class HostileInputTests(ITestOutputHelper output) : IAsyncLifetime
{
    /// <summary>The seed of the cases: fixed in the suite; PARTWISE_HOSTILE_SEED explores others.</summary>
    public static readonly int Seed = int.TryParse(Environment.GetEnvironmentVariable("PARTWISE_HOSTILE_SEED"), out var s) ? s : 20261202;

    private static readonly HostileLimits Limits = new(MaxBodyBytes: 256 * 1024, MaxParts: 40, MaxRows: 1_500, MaxScreeningSamples: 40);

    private readonly PartwiseFactory factory = PartwiseFactory.WithLimits(
        ("MaxBodyBytes", Limits.MaxBodyBytes.ToString(System.Globalization.CultureInfo.InvariantCulture)),
        ("MaxParts", Limits.MaxParts.ToString(System.Globalization.CultureInfo.InvariantCulture)),
        ("MaxRows", Limits.MaxRows.ToString(System.Globalization.CultureInfo.InvariantCulture)),
        ("MaxDistanceRows", "200"),
        ("MaxScreeningSamples", Limits.MaxScreeningSamples.ToString(System.Globalization.CultureInfo.InvariantCulture)));

    private HttpClient client = null!;
    private string baselineId = "b-none";
    private string flagId = "f-none";

    public async Task InitializeAsync()
    {
        client = factory.CreateClient();
        client.Timeout = TimeSpan.FromSeconds(60);
        var routes = Routes();
        var create = routes.SingleOrDefault(r => r.Key == "POST /v1/baselines")
            ?? throw new InvalidOperationException("no POST /v1/baselines among " + string.Join(", ", routes.Select(r => r.Key)));
        using (var created = await client.PostJson("/v1/baselines", create.JsonExample!))
        {
            Assert.Equal(HttpStatusCode.Created, created.StatusCode);
            baselineId = JsonDocument.Parse(await created.Content.ReadAsStringAsync()).RootElement.GetProperty("id").GetString()!;
        }

        // A sample far from the example baseline (sodium and chloride ten times up) raises a flag to review.
        const string far = "{\"sample\": {\"id\": \"hostile-far\", \"values\": {\"Ca\": 38.2, \"Na\": 315, \"HCO3\": 141.0, \"Cl\": 449}}}";
        using (var screened = await client.PostJson($"/v1/baselines/{baselineId}/screenings", far))
        {
            var result = (await screened.OkJson()).GetProperty("results")[0];
            Assert.Equal(JsonValueKind.String, result.GetProperty("flagId").ValueKind);
            flagId = result.GetProperty("flagId").GetString()!;
        }
    }

    public async Task DisposeAsync()
    {
        client.Dispose();
        await factory.DisposeAsync();
    }

    [Fact]
    public async Task NoHostileRequestOnAnyRouteGetsA5xxAndEveryRefusalIsAProblemDocument()
    {
        var routes = Routes();
        var generator = new HostileGenerator(routes, FillPath, Limits, Seed);

        // Each route's valid request works before: otherwise its mutations would test nothing.
        var before = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var route in routes.Where(r => r.Method != "DELETE"))
        {
            var (status, body) = await Send(generator.Valid(route));
            Assert.True(status is >= 200 and < 300, $"the valid request of {route.Key} answered {status}: {body}");
            before[route.Key] = body;
        }

        var cases = generator.Cases().ToList();
        var failures = new ConcurrentQueue<string>();
        var counts = new ConcurrentDictionary<string, int>(StringComparer.Ordinal);
        await Parallel.ForEachAsync(cases, new ParallelOptions { MaxDegreeOfParallelism = 4 }, async (c, _) =>
        {
            counts.AddOrUpdate(c.Route, 1, (_, n) => n + 1);
            var problem = await Check(c);
            if (problem is not null)
            {
                failures.Enqueue($"{problem}\n    {c}");
                // PARTWISE_HOSTILE_DUMP=DIR keeps the failing bodies whole, for reproducing one with curl.
                if (Environment.GetEnvironmentVariable("PARTWISE_HOSTILE_DUMP") is { } dump && c.Body is not null)
                {
                    await File.WriteAllBytesAsync(Path.Combine(dump, $"{failures.Count}.body"), c.Body, _);
                }
            }
        });

        output.WriteLine($"{cases.Count} hostile requests over {routes.Count} routes, seed {Seed}");
        Assert.True(failures.IsEmpty, $"{failures.Count} of {cases.Count} hostile requests were answered wrongly; the first ones:\n" + string.Join("\n", failures.Take(15)));
        Assert.True(cases.Count >= 1_000, $"only {cases.Count} cases");
        foreach (var route in routes)
        {
            var n = counts.GetValueOrDefault(route.Key);
            Assert.True(n >= 30, $"{route.Key} got {n} hostile requests; every route needs cases");
        }

        // The service is unharmed: alive, and every route's valid request still answers as before.
        using (var health = await client.GetAsync(new Uri("/healthz", UriKind.Relative)))
        {
            Assert.Equal("ok", (await health.OkJson()).GetProperty("status").GetString());
        }

        foreach (var route in routes.Where(r => r.Method != "DELETE"))
        {
            var (status, body) = await Send(generator.Valid(route));
            Assert.True(status is >= 200 and < 300, $"after the hostile requests the valid request of {route.Key} answered {status}: {body}");
            // The computations answer as before to the byte; stored state, flags and metrics move on.
            if (route.Template.StartsWith("/v1/", StringComparison.Ordinal)
                && !route.Template.StartsWith("/v1/baselines", StringComparison.Ordinal) && !route.Template.StartsWith("/v1/flags", StringComparison.Ordinal))
            {
                Assert.True(before[route.Key] == body, $"{route.Key} answers its valid request differently after the hostile requests");
            }
        }
    }

    [Fact]
    public void TheSameSeedGivesTheSameCases()
    {
        var routes = Routes();
        static string Fill(HostileRoute r) => r.Template.Replace("{id}", "b-1", StringComparison.Ordinal);
        var a = new HostileGenerator(routes, Fill, Limits, Seed).Cases().Select(c => c.ToString()).ToList();
        var b = new HostileGenerator(routes, Fill, Limits, Seed).Cases().Select(c => c.ToString()).ToList();
        Assert.Equal(a, b);
        var other = new HostileGenerator(routes, Fill, Limits, Seed + 1).Cases().Select(c => c.ToString()).ToList();
        Assert.NotEqual(a, other);
    }

    /// <summary>
    /// Every route the app maps, with its query parameters and body examples from the committed
    /// OpenAPI document (a route the document does not list still gets the cases that need no example).
    /// </summary>
    private List<HostileRoute> Routes()
    {
        var openApi = JsonNode.Parse(File.ReadAllText(OpenApiTests.CommittedPath()))!["paths"]!.AsObject();
        var routes = new List<HostileRoute>();
        foreach (var endpoint in factory.Services.GetRequiredService<EndpointDataSource>().Endpoints.OfType<RouteEndpoint>())
        {
            // An endpoint for any method (such as /metrics) is tried as a GET.
            var methods = endpoint.Metadata.GetMetadata<IHttpMethodMetadata>()?.HttpMethods ?? ["GET"];
            // A group's "" route has the group's prefix with a trailing slash as its raw text.
            var template = "/" + endpoint.RoutePattern.RawText!.Trim('/');
            foreach (var method in methods)
            {
                var operation = openApi[template]?[method.ToLowerInvariant()];
                var query = operation?["parameters"]?.AsArray().Where(p => p!["in"]!.GetValue<string>() == "query").Select(p => p!["name"]!.GetValue<string>()).ToArray() ?? [];
                var content = operation?["requestBody"]?["content"];
                var json = content?["application/json"]?["example"]?.ToJsonString();
                var csv = content?["text/csv"]?["example"]?.GetValue<string>();
                routes.Add(new HostileRoute(method, template, query, json, csv));
            }
        }

        Assert.True(routes.Count >= 19, $"only {routes.Count} routes found in the endpoint data source");
        return [.. routes.DistinctBy(r => r.Key).OrderBy(r => r.Key, StringComparer.Ordinal)];
    }

    /// <summary>Real ids in the path, except for DELETE, which gets a well-formed unknown id so nothing is deleted.</summary>
    private string FillPath(HostileRoute route)
    {
        var id = route.Method == "DELETE" ? "b-0000000000000000"
            : route.Template.StartsWith("/v1/flags/", StringComparison.Ordinal) ? flagId
            : route.Template.StartsWith("/v1/baselines/", StringComparison.Ordinal) ? baselineId
            : "v1";
        var s = new System.Text.StringBuilder();
        for (var i = 0; i < route.Template.Length; i++)
        {
            if (route.Template[i] == '{')
            {
                i = route.Template.IndexOf('}', i);
                s.Append(id);
            }
            else
            {
                s.Append(route.Template[i]);
            }
        }

        return s.ToString();
    }

    /// <summary>Null when the answer is acceptable, else what is wrong with it.</summary>
    private async Task<string?> Check(HostileCase c)
    {
        HttpResponseMessage response;
        try
        {
            response = await client.SendAsync(Request(c));
        }
        catch (Exception e) when (e is HttpRequestException or TaskCanceledException or InvalidOperationException)
        {
            return $"no answer: {e.GetType().Name}: {e.Message}";
        }

        using (response)
        {
            var status = (int)response.StatusCode;
            var text = await response.Content.ReadAsStringAsync();
            if (status >= 500)
            {
                return $"{status}: {text[..Math.Min(text.Length, 500)]}";
            }

            if (!response.Headers.Contains("X-Request-Id"))
            {
                return $"{status} without X-Request-Id";
            }

            return status >= 400 ? ProblemDefect(status, response.Content.Headers.ContentType?.MediaType, text) : null;
        }
    }

    /// <summary>Null when <paramref name="text"/> is an RFC 9457 problem document for <paramref name="status"/>.</summary>
    public static string? ProblemDefect(int status, string? mediaType, string text)
    {
        if (mediaType != "application/problem+json")
        {
            return $"{status} with Content-Type {mediaType ?? "(none)"}: {text[..Math.Min(text.Length, 300)]}";
        }

        try
        {
            using var document = JsonDocument.Parse(text);
            var root = document.RootElement;
            var ok = root.ValueKind == JsonValueKind.Object
                && root.TryGetProperty("type", out var type) && type.ValueKind == JsonValueKind.String && type.GetString()!.Length > 0
                && root.TryGetProperty("title", out var title) && title.ValueKind == JsonValueKind.String && title.GetString()!.Length > 0
                && root.TryGetProperty("status", out var s) && s.ValueKind == JsonValueKind.Number && s.GetInt32() == status;
            return ok ? null : $"{status} problem document without type, title or a matching status: {text[..Math.Min(text.Length, 300)]}";
        }
        catch (JsonException)
        {
            return $"{status} problem document that is not JSON: {text[..Math.Min(text.Length, 300)]}";
        }
    }

    private async Task<(int Status, string Body)> Send(HostileCase c)
    {
        using var response = await client.SendAsync(Request(c));
        return ((int)response.StatusCode, await response.Content.ReadAsStringAsync());
    }

    private static HttpRequestMessage Request(HostileCase c)
    {
        var request = new HttpRequestMessage(new HttpMethod(c.Method), new Uri(c.Target, UriKind.Relative));
        if (c.Body is not null)
        {
            request.Content = new ByteArrayContent(c.Body);
            if (c.ContentType is not null)
            {
                request.Content.Headers.TryAddWithoutValidation("Content-Type", c.ContentType);
            }
        }

        foreach (var (name, value) in c.Headers)
        {
            request.Headers.TryAddWithoutValidation(name, value);
        }

        return request;
    }
}
