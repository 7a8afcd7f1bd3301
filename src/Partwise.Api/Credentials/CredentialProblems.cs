using Microsoft.AspNetCore.Authorization;
using Microsoft.AspNetCore.Authorization.Infrastructure;
using Microsoft.AspNetCore.Authorization.Policy;
using Partwise.Api.Infrastructure;
using Partwise.Core.Problems;

namespace Partwise.Api.Credentials;

/// <summary>401 and 403 as RFC 9457 problem documents, like every other refusal of this service.</summary>
public static class CredentialProblems
{
    /// <summary>Writes the problem document of <paramref name="problemType"/> with <paramref name="detail"/>.</summary>
    public static Task WriteAsync(HttpContext context, string problemType, string detail) =>
        TypedResults.Problem(ProblemCatalog.Create(problemType, detail, [])).ExecuteAsync(context);

    /// <summary>The detail of a 403: who called and which roles the route takes.</summary>
    public static string ForbiddenDetail(string? name, IEnumerable<string> roles)
    {
        var needed = roles.Distinct(StringComparer.Ordinal).ToArray();
        var who = string.IsNullOrEmpty(name) ? "This key" : $"The key '{name}'";
        return needed.Length == 0
            ? $"{who} may not call this route."
            : $"{who} does not hold the role this route needs: {string.Join(" or ", needed.Select(r => $"'{r}'"))}.";
    }
}

/// <summary>
/// Answers a failed authorization with a 403 problem document that names the role the route needs; challenges
/// (no or a wrong key) go to <see cref="BearerKeyHandler"/>, which writes the 401.
/// </summary>
public sealed class ForbiddenProblemResultHandler : IAuthorizationMiddlewareResultHandler
{
    private readonly AuthorizationMiddlewareResultHandler _default = new();

    /// <inheritdoc />
    public Task HandleAsync(RequestDelegate next, HttpContext context, AuthorizationPolicy policy, PolicyAuthorizationResult authorizeResult)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(authorizeResult);
        if (!authorizeResult.Forbidden)
        {
            return _default.HandleAsync(next, context, policy, authorizeResult);
        }

        var roles = authorizeResult.AuthorizationFailure?.FailedRequirements
            .OfType<RolesAuthorizationRequirement>()
            .SelectMany(r => r.AllowedRoles) ?? [];
        return CredentialProblems.WriteAsync(context, ProblemTypes.Forbidden, CredentialProblems.ForbiddenDetail(context.User.Identity?.Name, roles));
    }
}
