using System.Net.Http.Headers;
using System.Security.Cryptography;
using System.Text;
using Microsoft.AspNetCore.Hosting;
using Partwise.Api.Tests.Support;
using Serilog.Events;

namespace Partwise.Api.Tests;

public class LoggingTests
{
    [Fact]
    public async Task EachRequestWritesOneCompletionEventWithItsShapeButNoValues()
    {
        using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/v1/coordinates", UriKind.Relative))
        {
            Content = new StringContent(
                "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[31.917, 8.113, 12.471], [28.433, 7.619, 11.829]], \"transform\": {\"type\": \"clr\"}}",
                System.Text.Encoding.UTF8,
                "application/json"),
        };
        request.Headers.Add("X-Request-Id", "log-check-1");
        using var response = await client.SendAsync(request);
        await response.OkJson();

        var completion = Assert.Single(factory.Logs.Events, IsCompletion);
        Assert.Equal(LogEventLevel.Information, completion.Level);
        Assert.Equal("\"log-check-1\"", completion.Properties["RequestId"].ToString());
        Assert.Equal("3", completion.Properties["PartCount"].ToString());
        Assert.Equal("2", completion.Properties["RowCount"].ToString());
        Assert.Equal("200", completion.Properties["StatusCode"].ToString());
        Assert.Equal("\"/v1/coordinates\"", completion.Properties["Route"].ToString());
        Assert.True(completion.Properties.ContainsKey("Elapsed"));

        // No event carries a measured value.
        foreach (var e in factory.Logs.Events)
        {
            var text = e.RenderMessage() + string.Join(" ", e.Properties.Values);
            Assert.DoesNotContain("31.917", text, StringComparison.Ordinal);
            Assert.DoesNotContain("7.619", text, StringComparison.Ordinal);
        }

        // The framework's own per-request information events are quieted.
        Assert.DoesNotContain(factory.Logs.Events, e => e.Level <= LogEventLevel.Information && Source(e).StartsWith("Microsoft.AspNetCore", StringComparison.Ordinal));
    }

    [Fact]
    public async Task AFailedBindingStillLogsOneCompletionEventWithItsRoute()
    {
        using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/summary", "{\"rows\": [[1, NaN]]}");
        await response.Problem(400, "/problems/invalid-input", "/rows/0/1");
        var completion = Assert.Single(factory.Logs.Events, IsCompletion);
        Assert.Equal("400", completion.Properties["StatusCode"].ToString());
        Assert.Equal("\"/v1/summary\"", completion.Properties["Route"].ToString());
        Assert.Equal(LogEventLevel.Information, completion.Level);
    }

    [Fact]
    public async Task TheCompletionEventNamesTheCallersKeyButNeverTheCredentialsOrTheValues()
    {
        await using var factory = new PartwiseFactory();
        using var keyed = factory.WithWebHostBuilder(WithKey);
        using var client = keyed.CreateClient();
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/v1/coordinates", UriKind.Relative))
        {
            Content = new StringContent(
                "{\"parts\": [\"Ca\", \"Mg\", \"Na\"], \"rows\": [[41.203, 9.817, 22.649]], \"transform\": {\"type\": \"clr\"}}",
                System.Text.Encoding.UTF8,
                "application/json"),
        };
        request.Headers.Authorization = new AuthenticationHeaderValue("Bearer", LoggedKey);
        request.Headers.Add("X-Request-Id", "log-key-1");
        using var response = await client.SendAsync(request);
        await response.OkJson();

        var completion = Assert.Single(factory.Logs.Events, IsCompletion);
        Assert.Equal("\"log-key-1\"", completion.Properties["RequestId"].ToString());
        Assert.Equal("\"lab-ingest\"", completion.Properties["key"].ToString());
        foreach (var e in factory.Logs.Events)
        {
            var text = e.RenderMessage() + string.Join(" ", e.Properties.Select(p => p.Key + "=" + p.Value));
            Assert.DoesNotContain(LoggedKey, text, StringComparison.Ordinal);
            Assert.DoesNotContain("Bearer", text, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("Authorization", text, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("41.203", text, StringComparison.Ordinal);
            Assert.DoesNotContain("22.649", text, StringComparison.Ordinal);
        }
    }

    [Fact]
    public async Task ARequestWithoutAKeyLogsNoKey()
    {
        await using var factory = new PartwiseFactory();
        using var keyed = factory.WithWebHostBuilder(WithKey);
        using var client = keyed.CreateClient();
        using var response = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        await response.OkJson();
        var completion = Assert.Single(factory.Logs.Events, IsCompletion);
        Assert.False(completion.Properties.ContainsKey("key"));
        Assert.True(completion.Properties.ContainsKey("RequestId"));
    }

    private static bool IsCompletion(LogEvent e) => Source(e) == "Serilog.AspNetCore.RequestLoggingMiddleware";

    private static string Source(LogEvent e) =>
        e.Properties.TryGetValue("SourceContext", out var value) ? value.ToString().Trim('"') : "";

    private const string LoggedKey = "pw-secret-0c9e4f71d2";

    // One configured key, named lab-ingest, for the key above (stored as its SHA-256, as the configuration keeps it).
    private static void WithKey(IWebHostBuilder builder) => builder
        .UseSetting("Partwise:Credentials:Keys:0:Name", "lab-ingest")
        .UseSetting("Partwise:Credentials:Keys:0:Sha256", Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(LoggedKey))))
        .UseSetting("Partwise:Credentials:Keys:0:Roles:0", "reader");
}
