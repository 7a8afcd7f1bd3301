using Microsoft.AspNetCore.Authorization;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Credentials;

/// <summary>
/// Declares the Bearer scheme on every operation that needs a key, with the role it needs in the description (the
/// 401 and 403 responses come from <see cref="CredentialsSetup.RequireRole"/>); operations that take no key (<c>AllowAnonymous</c>) are left without
/// security. Register it after <c>EndpointTextFilter</c>, which sets the description this one extends.
/// </summary>
public sealed class CredentialsOperationFilter : IOperationFilter
{
    /// <summary>The name of the security scheme in <c>components.securitySchemes</c>.</summary>
    public const string SchemeId = "bearer";

    /// <summary>The scheme as the document declares it.</summary>
    public static OpenApiSecurityScheme Scheme() => new()
    {
        Type = SecuritySchemeType.Http,
        Scheme = "bearer",
        Description =
            "`Authorization: Bearer <key>`. Keys are configured as SHA-256 hashes (`hash-key` makes one) with roles " +
            "`reader`, `submitter`, `reviewer` and `admin` (admin holds all). Stateless compute endpoints take any valid " +
            "key. With no key configured, only loopback callers are served. A missing or unknown key is a 401 " +
            "`/problems/unauthorized`, a key without the route's role a 403 `/problems/forbidden`.",
    };

    /// <inheritdoc />
    public void Apply(OpenApiOperation operation, OperationFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(operation);
        ArgumentNullException.ThrowIfNull(context);
        var metadata = context.ApiDescription.ActionDescriptor.EndpointMetadata;
        if (metadata.OfType<IAllowAnonymous>().Any())
        {
            return;
        }

        var roles = metadata.OfType<IAuthorizeData>().Select(a => a.Policy).OfType<string>().Where(Roles.IsKnown).ToArray();
        operation.Security ??= [];
        operation.Security.Add(new OpenApiSecurityRequirement { [new OpenApiSecuritySchemeReference(SchemeId, context.Document)] = [] });
        var needs = roles.Length == 0 ? "any valid key" : $"a key with the role {string.Join(" and ", roles.Select(r => $"`{r}`"))} (or `admin`)";
        if (roles.Contains(Roles.Admin, StringComparer.Ordinal))
        {
            needs = "a key with the role `admin`";
        }

        operation.Description = $"{operation.Description}\n\nCredentials: {needs}.".TrimStart();
    }
}
