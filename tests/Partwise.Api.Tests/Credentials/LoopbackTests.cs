using System.Net;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Credentials;

/// <summary>With no key configured the service serves callers on the same machine only, each holding every role.</summary>
public class LoopbackTests
{
    [Theory]
    [InlineData("127.0.0.1")]
    [InlineData("127.8.9.10")]
    [InlineData("::1")]
    [InlineData("::ffff:127.0.0.1")]
    public async Task ALoopbackCallerHoldsEveryRoleWhenNoKeyIsConfigured(string address)
    {
        await using var factory = new PartwiseFactory { RemoteAddress = IPAddress.Parse(address) };
        using var client = factory.CreateClient();
        using (var list = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative)))
        {
            await list.OkJson();
        }

        // An admin route answers with its own 400 for the empty body, not with 401 or 403.
        using var create = await client.PostJson("/v1/baselines", "{}");
        Assert.Equal(HttpStatusCode.BadRequest, create.StatusCode);
    }

    [Theory]
    [InlineData("203.0.113.7")]
    [InlineData("192.168.1.20")]
    [InlineData("2001:db8::5")]
    public async Task ACallerFromTheNetworkIs401WhenNoKeyIsConfigured(string address)
    {
        await using var factory = new PartwiseFactory { RemoteAddress = IPAddress.Parse(address) };
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/summary", """{"parts":["a","b"],"rows":[[1,2]]}""");
        var problem = await response.Problem(401, "/problems/unauthorized");
        Assert.Contains("loopback", problem.GetProperty("detail").GetString(), StringComparison.Ordinal);
        Assert.Equal("Bearer", Assert.Single(response.Headers.WwwAuthenticate).Scheme);

        using var health = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, health.StatusCode);
    }

    [Fact]
    public async Task ACallerWithAKeyFromTheNetworkIsStill401WhenNoKeyIsConfigured()
    {
        await using var factory = new PartwiseFactory { RemoteAddress = CredentialHosts.Remote };
        using var client = CredentialHosts.Client(factory, CredentialHosts.Keys["admin-1"].Key);
        using var response = await client.GetAsync(new Uri("/v1/flags", UriKind.Relative));
        await response.Problem(401, "/problems/unauthorized");
    }

    [Fact]
    public async Task ARequestWithoutAKnownRemoteAddressIsNotTakenForLoopback()
    {
        // The bare in-process server gives no remote address: the service cannot tell where the caller is.
        await using var factory = new PartwiseFactory { RemoteAddress = null };
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
        await response.Problem(401, "/problems/unauthorized");
    }

    [Fact]
    public async Task WithKeysConfiguredALoopbackCallerNeedsAKeyToo()
    {
        await using var factory = PartwiseFactory.WithSettings(CredentialHosts.Settings());
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
        await response.Problem(401, "/problems/unauthorized");
    }

    [Fact]
    public async Task TheStartUpLogSaysThatOnlyLoopbackCallersAreServed()
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        var warning = Assert.Single(factory.Logs.Events, e => e.MessageTemplate.Text.Contains("No credentials configured", StringComparison.Ordinal));
        Assert.Equal(Serilog.Events.LogEventLevel.Warning, warning.Level);
        Assert.Contains("loopback callers only", warning.RenderMessage(), StringComparison.Ordinal);
    }
}
