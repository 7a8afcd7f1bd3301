using System.Net;
using System.Security.Claims;
using System.Text.Encodings.Web;
using Microsoft.AspNetCore.Authentication;
using Microsoft.Extensions.Options;
using Microsoft.Net.Http.Headers;
using Partwise.Core.Problems;

namespace Partwise.Api.Credentials;

/// <summary>
/// The <c>Bearer</c> scheme (RFC 6750 §2.1): <c>Authorization: Bearer &lt;key&gt;</c>, the key's SHA-256 looked
/// up among the configured ones. With no key configured, a caller whose connection comes from a loopback address
/// holds every role under the name <c>loopback</c>, and everyone else is refused. A refusal is a 401 problem
/// document with <c>WWW-Authenticate: Bearer</c>. The key itself is never logged nor put in a message.
/// </summary>
public sealed class BearerKeyHandler(
    IOptionsMonitor<AuthenticationSchemeOptions> options,
    ILoggerFactory logger,
    UrlEncoder encoder,
    KeyRing keys)
    : AuthenticationHandler<AuthenticationSchemeOptions>(options, logger, encoder)
{
    /// <summary>The scheme's name, as it appears in the header.</summary>
    public const string SchemeName = "Bearer";

    /// <summary>The name a loopback caller goes by when no key is configured.</summary>
    public const string LoopbackName = "loopback";

    private const string NoKeyConfigured = "No key is configured, so only callers on this machine (loopback) are served.";
    private const string UnknownKey = "The key is not known.";
    private const string Malformed = "The Authorization header must be 'Bearer <key>' with one key.";

    /// <inheritdoc />
    protected override Task<AuthenticateResult> HandleAuthenticateAsync()
    {
        if (keys.IsEmpty)
        {
            return Task.FromResult(IsLoopback(Context.Connection.RemoteIpAddress)
                ? Success(new Holder(LoopbackName, Roles.All))
                : AuthenticateResult.Fail(NoKeyConfigured));
        }

        var headers = Request.Headers.Authorization;
        if (headers.Count == 0)
        {
            return Task.FromResult(AuthenticateResult.NoResult());
        }

        var header = headers.Count == 1 ? headers[0] : null;
        if (header is null || !header.StartsWith(SchemeName + " ", StringComparison.OrdinalIgnoreCase))
        {
            return Task.FromResult(AuthenticateResult.Fail(Malformed));
        }

        var key = header[(SchemeName.Length + 1)..].Trim();
        if (key.Length == 0 || key.Contains(' ', StringComparison.Ordinal))
        {
            return Task.FromResult(AuthenticateResult.Fail(Malformed));
        }

        var holder = keys.Find(key);
        return Task.FromResult(holder is null ? AuthenticateResult.Fail(UnknownKey) : Success(holder));
    }

    /// <inheritdoc />
    protected override async Task HandleChallengeAsync(AuthenticationProperties properties)
    {
        var result = await HandleAuthenticateOnceSafeAsync().ConfigureAwait(false);
        var detail = result.Failure?.Message
            ?? "This route needs a key: send 'Authorization: Bearer <key>' (see the Credentials section of the README).";
        // RFC 6750 §3: a presented key that fails is an invalid_token; a missing one gets the bare challenge.
        Response.Headers[HeaderNames.WWWAuthenticate] = result.Failure is null || keys.IsEmpty
            ? SchemeName
            : $"{SchemeName} error=\"invalid_token\"";
        await CredentialProblems.WriteAsync(Context, ProblemTypes.Unauthorized, detail).ConfigureAwait(false);
    }

    /// <inheritdoc />
    protected override Task HandleForbiddenAsync(AuthenticationProperties properties) =>
        CredentialProblems.WriteAsync(Context, ProblemTypes.Forbidden, CredentialProblems.ForbiddenDetail(Context.User.Identity?.Name, []));

    /// <summary>
    /// Whether a connection comes from this machine. An unknown address (no socket, as in an in-process test host)
    /// is not loopback: the service cannot tell where such a caller is.
    /// </summary>
    public static bool IsLoopback(IPAddress? address) =>
        address is not null && IPAddress.IsLoopback(address.IsIPv4MappedToIPv6 ? address.MapToIPv4() : address);

    private AuthenticateResult Success(Holder holder)
    {
        List<Claim> claims = [new(ClaimTypes.Name, holder.Name), .. holder.Roles.Select(r => new Claim(ClaimTypes.Role, r))];
        var identity = new ClaimsIdentity(claims, SchemeName, ClaimTypes.Name, ClaimTypes.Role);
        return AuthenticateResult.Success(new AuthenticationTicket(new ClaimsPrincipal(identity), SchemeName));
    }
}
