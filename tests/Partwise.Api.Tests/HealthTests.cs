using System.Net;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests;

public class HealthTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    [Fact]
    public async Task HealthzAnswersStatusOk()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        var body = await response.OkJson();
        Assert.Equal("ok", body.GetProperty("status").GetString());
    }

    [Fact]
    public async Task EveryResponseCarriesAGeneratedRequestId()
    {
        using var client = factory.CreateClient();
        using var first = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        using var second = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        var a = Assert.Single(first.Headers.GetValues("X-Request-Id"));
        var b = Assert.Single(second.Headers.GetValues("X-Request-Id"));
        Assert.False(string.IsNullOrWhiteSpace(a));
        Assert.NotEqual(a, b);
    }

    [Fact]
    public async Task ASaneCallerRequestIdIsEchoed()
    {
        using var client = factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/healthz", UriKind.Relative));
        request.Headers.Add("X-Request-Id", "lab-run 42/7");
        using var response = await client.SendAsync(request);
        Assert.Equal("lab-run 42/7", Assert.Single(response.Headers.GetValues("X-Request-Id")));
    }

    [Theory]
    [InlineData(129)]
    [InlineData(5000)]
    public async Task AnOverlongCallerRequestIdIsReplaced(int length)
    {
        using var client = factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/healthz", UriKind.Relative));
        var id = new string('x', length);
        request.Headers.Add("X-Request-Id", id);
        using var response = await client.SendAsync(request);
        var echoed = Assert.Single(response.Headers.GetValues("X-Request-Id"));
        Assert.NotEqual(id, echoed);
        Assert.InRange(echoed.Length, 1, 128);
    }

    [Fact]
    public async Task ARequestIdWithNonAsciiCharactersIsReplaced()
    {
        using var client = factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/healthz", UriKind.Relative));
        request.Headers.TryAddWithoutValidation("X-Request-Id", "brunnen-ü");
        using var response = await client.SendAsync(request);
        Assert.NotEqual("brunnen-ü", Assert.Single(response.Headers.GetValues("X-Request-Id")));
    }

    [Fact]
    public async Task ErrorsCarryTheRequestIdToo()
    {
        using var client = factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/v1/coordinates", UriKind.Relative))
        {
            Content = new StringContent("{", System.Text.Encoding.UTF8, "application/json"),
        };
        request.Headers.Add("X-Request-Id", "sample-batch-9");
        using var response = await client.SendAsync(request);
        await response.Problem(400, "/problems/invalid-input");
        Assert.Equal("sample-batch-9", Assert.Single(response.Headers.GetValues("X-Request-Id")));
    }

    [Fact]
    public async Task AnUnknownPathIsA404ProblemDocument()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/v1/nowhere", UriKind.Relative));
        await response.Problem(404, "/problems/not-found");
        Assert.True(response.Headers.Contains("X-Request-Id"));
    }

    [Fact]
    public async Task AWrongMethodIsA405ProblemDocument()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/v1/coordinates", UriKind.Relative));
        await response.Problem(405, "/problems/method-not-allowed");
    }

    [Fact]
    public async Task TheInteractivePageIsServedAtDocs()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/docs/index.html", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        Assert.Contains("swagger", await response.Content.ReadAsStringAsync(), StringComparison.OrdinalIgnoreCase);
    }
}
