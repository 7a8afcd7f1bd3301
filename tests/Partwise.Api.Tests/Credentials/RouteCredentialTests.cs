using System.Net;
using System.Text.RegularExpressions;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.DependencyInjection;
using Partwise.Api.Credentials;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Credentials;

/// <summary>
/// Every route of the running app against the role API.md gives it: no key is a 401 problem, a wrong key a 401, a
/// key without the role a 403 problem, the right role (and admin) neither. The routes come from the app's
/// endpoints, so a route added later fails <see cref="EveryRouteOfTheAppHasAnExpectedRole"/> until it is listed here.
/// </summary>
public partial class RouteCredentialTests(KeyedHost host) : IClassFixture<KeyedHost>
{
    /// <summary>Takes no key at all.</summary>
    private const string None = "none";

    /// <summary>Takes any valid key, whatever its roles.</summary>
    private const string Any = "any";

    /// <summary>The contract (API.md, "Operations" and the role column): method and route pattern → role.</summary>
    public static readonly IReadOnlyDictionary<string, string> Expected = new Dictionary<string, string>(StringComparer.Ordinal)
    {
        ["GET /healthz"] = None,
        ["GET /readyz"] = None,
        ["* /metrics"] = None,
        ["POST /v1/compositions/prepare"] = Any,
        ["POST /v1/coordinates"] = Any,
        ["POST /v1/coordinates/inverse"] = Any,
        ["POST /v1/summary"] = Any,
        ["POST /v1/distances"] = Any,
        ["POST /v1/ratio-selection"] = Any,
        ["POST /v1/ratio-sets/evaluate"] = Any,
        ["POST /v1/ratio-sets/reconstruct"] = Any,
        ["POST /v1/lra"] = Any,
        ["POST /v1/screenings"] = Any,
        ["POST /v1/baselines"] = Roles.Admin,
        ["GET /v1/baselines"] = Roles.Reader,
        ["GET /v1/baselines/{id}"] = Roles.Reader,
        ["GET /v1/baselines/{id}/biplot"] = Roles.Reader,
        ["GET /review"] = None,
        ["GET /review/review.css"] = None,
        ["GET /review/review.js"] = None,
        ["DELETE /v1/baselines/{id}"] = Roles.Admin,
        ["POST /v1/baselines/{id}/screenings"] = Roles.Submitter,
        ["GET /v1/flags"] = Roles.Reader,
        ["POST /v1/flags/{id}/review"] = Roles.Reviewer,
    };

    public static TheoryData<string, string> Routes()
    {
        var data = new TheoryData<string, string>();
        foreach (var (route, role) in Expected)
        {
            data.Add(route, role);
        }

        return data;
    }

    [Fact]
    public void EveryRouteOfTheAppHasAnExpectedRole()
    {
        var routes = AppRoutes(host.Factory);
        var missing = routes.Except(Expected.Keys).ToArray();
        var gone = Expected.Keys.Except(routes).ToArray();
        Assert.True(missing.Length == 0, "Routes without an expected role in RouteCredentialTests.Expected (add them with their role from API.md): " + string.Join(", ", missing));
        Assert.True(gone.Length == 0, "Routes in RouteCredentialTests.Expected that the app no longer has: " + string.Join(", ", gone));
    }

    [Theory]
    [MemberData(nameof(Routes))]
    public async Task WithoutAKeyARouteThatNeedsOneIs401AndTheOthersAnswer(string route, string role)
    {
        using var client = CredentialHosts.Client(host.Factory, key: null);
        using var response = await Send(client, route);
        if (role == None)
        {
            Assert.True(response.StatusCode is not (HttpStatusCode.Unauthorized or HttpStatusCode.Forbidden), $"{route}: {(int)response.StatusCode}");
            return;
        }

        await response.Problem(401, "/problems/unauthorized");
        Assert.Equal("Bearer", Assert.Single(response.Headers.WwwAuthenticate).Scheme);
    }

    [Theory]
    [MemberData(nameof(Routes))]
    public async Task AWrongKeyIs401WithInvalidTokenWhereAKeyIsNeeded(string route, string role)
    {
        using var client = CredentialHosts.Client(host.Factory, CredentialHosts.WrongKey);
        using var response = await Send(client, route);
        if (role == None)
        {
            Assert.True(response.StatusCode is not (HttpStatusCode.Unauthorized or HttpStatusCode.Forbidden), $"{route}: {(int)response.StatusCode}");
            return;
        }

        var problem = await response.Problem(401, "/problems/unauthorized");
        Assert.Equal("The key is not known.", problem.GetProperty("detail").GetString());
        var challenge = Assert.Single(response.Headers.WwwAuthenticate);
        Assert.Equal("Bearer", challenge.Scheme);
        Assert.Equal("error=\"invalid_token\"", challenge.Parameter);
    }

    [Theory]
    [MemberData(nameof(Routes))]
    public async Task AKeyWithoutTheRoleIs403NamingTheRoleAndTheKey(string route, string role)
    {
        foreach (var (name, (key, roles)) in CredentialHosts.Keys)
        {
            if (role is None or Any || Roles.Implied(roles).Contains(role))
            {
                continue;
            }

            using var client = CredentialHosts.Client(host.Factory, key);
            using var response = await Send(client, route);
            var problem = await response.Problem(403, "/problems/forbidden");
            var detail = problem.GetProperty("detail").GetString()!;
            Assert.Contains($"'{name}'", detail, StringComparison.Ordinal);
            Assert.Contains($"'{role}'", detail, StringComparison.Ordinal);
        }
    }

    [Theory]
    [MemberData(nameof(Routes))]
    public async Task EveryKeyHoldingTheRoleIsLetThrough(string route, string role)
    {
        var holders = CredentialHosts.Keys.Where(k => role is None or Any || Roles.Implied(k.Value.Roles).Contains(role)).ToArray();
        Assert.Contains(holders, k => k.Key == "admin-1");
        foreach (var (name, (key, _)) in holders)
        {
            using var client = CredentialHosts.Client(host.Factory, key);
            using var response = await Send(client, route);
            var status = (int)response.StatusCode;
            // The bodies are empty objects and the ids unknown: a 400, 404 or 422 is the route's own answer.
            Assert.True(status is not (401 or 403) and < 500, $"{route} with {name}: {status} {await response.Content.ReadAsStringAsync()}");
        }
    }

    [Theory]
    [InlineData("/openapi/v1.json")]
    [InlineData("/docs/index.html")]
    public async Task TheApiDocumentAndPageTakeNoKey(string path)
    {
        using var client = CredentialHosts.Client(host.Factory, key: null);
        using var response = await client.GetAsync(new Uri(path, UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
    }

    [Fact]
    public async Task AnUnknownPathIs401WithoutAKeyAnd404WithOne()
    {
        // The fallback policy needs a key, so a caller without one learns nothing of which paths exist.
        var path = new Uri("/v1/no-such-route", UriKind.Relative);
        using (var anonymous = CredentialHosts.Client(host.Factory, key: null))
        using (var response = await anonymous.GetAsync(path))
        {
            await response.Problem(401, "/problems/unauthorized");
        }

        using var keyed = CredentialHosts.Client(host.Factory, CredentialHosts.Keys["compute-1"].Key);
        using var found = await keyed.GetAsync(path);
        await found.Problem(404, "/problems/not-found");
    }

    [Theory]
    [InlineData("Basic cmVhZGVyOnNlY3JldA==")]
    [InlineData("Bearer")]
    [InlineData("Bearer ")]
    [InlineData("Bearer two keys")]
    public async Task AMalformedAuthorizationHeaderIs401(string header)
    {
        using var client = host.Factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/v1/baselines", UriKind.Relative));
        Assert.True(request.Headers.TryAddWithoutValidation("Authorization", header));
        using var response = await client.SendAsync(request);
        await response.Problem(401, "/problems/unauthorized");
    }

    [Fact]
    public async Task TheSchemeNameIsCaseInsensitive()
    {
        // RFC 9110 §11.1: the authentication scheme is a case-insensitive token.
        using var client = host.Factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/v1/baselines", UriKind.Relative));
        Assert.True(request.Headers.TryAddWithoutValidation("Authorization", "bearer " + CredentialHosts.Keys["reader-1"].Key));
        using var response = await client.SendAsync(request);
        await response.OkJson();
    }

    /// <summary>"METHOD pattern" for every route endpoint of the running app.</summary>
    public static string[] AppRoutes(PartwiseFactory factory)
    {
        ArgumentNullException.ThrowIfNull(factory);
        var source = factory.Services.GetRequiredService<EndpointDataSource>();
        return
        [
            .. source.Endpoints.OfType<RouteEndpoint>()
                .SelectMany(e => (e.Metadata.GetMetadata<IHttpMethodMetadata>()?.HttpMethods ?? ["*"]).Select(m => $"{m} {Normalize(e.RoutePattern.RawText)}"))
                .Distinct(StringComparer.Ordinal)
                .Order(StringComparer.Ordinal),
        ];
    }

    /// <summary>A group's empty route ends in a slash ("/v1/flags/"); the path is served with or without it.</summary>
    private static string Normalize(string? pattern) =>
        pattern is null or "/" ? pattern ?? "" : pattern.TrimEnd('/');

    /// <summary>One request to <paramref name="route"/> ("METHOD pattern"), parameters filled with an unknown id and POST bodies empty objects.</summary>
    private static Task<HttpResponseMessage> Send(HttpClient client, string route)
    {
        var space = route.IndexOf(' ', StringComparison.Ordinal);
        // "*": an endpoint mapped for every method (no method metadata); GET stands for them all.
        var method = route[..space] == "*" ? HttpMethod.Get : new HttpMethod(route[..space]);
        var path = Parameter().Replace(route[(space + 1)..], "no-such-id");
        var request = new HttpRequestMessage(method, new Uri(path, UriKind.Relative));
        if (method == HttpMethod.Post)
        {
            request.Content = new StringContent("{}", System.Text.Encoding.UTF8, "application/json");
        }

        return SendAndDispose(client, request);
    }

    private static async Task<HttpResponseMessage> SendAndDispose(HttpClient client, HttpRequestMessage request)
    {
        using (request)
        {
            return await client.SendAsync(request);
        }
    }

    [GeneratedRegex(@"\{[^}]+\}")]
    private static partial Regex Parameter();
}
