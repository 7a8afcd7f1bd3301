using System.Net;
using System.Security.Claims;
using System.Text.Encodings.Web;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Options;
using Partwise.Api.Credentials;

namespace Partwise.Api.Tests.Credentials;

/// <summary>The identity the scheme gives a caller: the key's name as ClaimTypes.Name and one role claim per role.</summary>
public class BearerKeyHandlerTests
{
    private static CredentialsOptions Options(params (string Name, string Key, string[] Roles)[] keys)
    {
        var options = new CredentialsOptions();
        foreach (var (name, key, roles) in keys)
        {
            options.Keys.Add(new CredentialKey { Name = name, Sha256 = CredentialHosts.Sha256Hex(key), Roles = roles });
        }

        return options;
    }

    private static async Task<AuthenticateResult> Authenticate(CredentialsOptions options, string? authorization, IPAddress? remote)
    {
        var context = new DefaultHttpContext();
        context.Connection.RemoteIpAddress = remote;
        if (authorization is not null)
        {
            context.Request.Headers.Authorization = authorization;
        }

        var handler = new BearerKeyHandler(new SchemeOptions(), NullLoggerFactory.Instance, UrlEncoder.Default, new KeyRing(Microsoft.Extensions.Options.Options.Create(options)));
        await handler.InitializeAsync(new AuthenticationScheme(BearerKeyHandler.SchemeName, null, typeof(BearerKeyHandler)), context);
        return await handler.AuthenticateAsync();
    }

    [Fact]
    public async Task AKnownKeyGivesItsNameAndRoles()
    {
        var result = await Authenticate(Options(("pipeline-1", "key-one-aaaaaaaaaaaaaaaaaaaa", ["submitter", "reader"]), ("other", "key-two-bbbbbbbbbbbbbbbbbbbbbb", ["reviewer"])), "Bearer key-one-aaaaaaaaaaaaaaaaaaaa", CredentialHosts.Remote);
        Assert.True(result.Succeeded);
        var user = result.Principal!;
        Assert.Equal("pipeline-1", user.Identity!.Name);
        Assert.Equal("pipeline-1", user.FindFirstValue(ClaimTypes.Name));
        Assert.Equal(["reader", "submitter"], user.FindAll(ClaimTypes.Role).Select(c => c.Value).Order(StringComparer.Ordinal));
        Assert.True(user.IsInRole("submitter"));
        Assert.False(user.IsInRole("reviewer"));
    }

    [Fact]
    public async Task AnAdminKeyHoldsEveryRole()
    {
        var result = await Authenticate(Options(("ops", "key-admin-cccccccccccccccccccc", ["admin"])), "Bearer key-admin-cccccccccccccccccccc", CredentialHosts.Remote);
        Assert.Equal(["admin", "reader", "reviewer", "submitter"], result.Principal!.FindAll(ClaimTypes.Role).Select(c => c.Value).Order(StringComparer.Ordinal));
    }

    [Fact]
    public async Task ALoopbackCallerWithoutConfiguredKeysIsNamedLoopbackAndHoldsEveryRole()
    {
        var result = await Authenticate(new CredentialsOptions(), authorization: null, IPAddress.Loopback);
        Assert.True(result.Succeeded);
        Assert.Equal("loopback", result.Principal!.Identity!.Name);
        Assert.Equal(["admin", "reader", "reviewer", "submitter"], result.Principal.FindAll(ClaimTypes.Role).Select(c => c.Value).Order(StringComparer.Ordinal));
    }

    [Fact]
    public async Task NoHeaderIsNoResultAndAWrongKeyAFailureThatDoesNotRepeatTheKey()
    {
        var options = Options(("pipeline-1", "key-one-aaaaaaaaaaaaaaaaaaaa", ["reader"]));
        Assert.True((await Authenticate(options, authorization: null, IPAddress.Loopback)).None);
        var wrong = await Authenticate(options, "Bearer key-one-aaaaaaaaaaaaaaaaaaab", IPAddress.Loopback);
        Assert.NotNull(wrong.Failure);
        Assert.DoesNotContain("key-one", wrong.Failure.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void OnlyLoopbackAddressesAreLoopback()
    {
        Assert.True(BearerKeyHandler.IsLoopback(IPAddress.Parse("127.0.0.1")));
        Assert.True(BearerKeyHandler.IsLoopback(IPAddress.IPv6Loopback));
        Assert.True(BearerKeyHandler.IsLoopback(IPAddress.Parse("::ffff:127.0.0.1")));
        Assert.False(BearerKeyHandler.IsLoopback(null));
        Assert.False(BearerKeyHandler.IsLoopback(IPAddress.Any));
        Assert.False(BearerKeyHandler.IsLoopback(IPAddress.Parse("::ffff:10.0.0.1")));
        Assert.False(BearerKeyHandler.IsLoopback(IPAddress.Parse("198.51.100.3")));
    }

    private sealed class SchemeOptions : IOptionsMonitor<AuthenticationSchemeOptions>
    {
        public AuthenticationSchemeOptions CurrentValue { get; } = new();

        public AuthenticationSchemeOptions Get(string? name) => CurrentValue;

        public IDisposable? OnChange(Action<AuthenticationSchemeOptions, string?> listener) => null;
    }
}
