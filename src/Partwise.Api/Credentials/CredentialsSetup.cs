using Microsoft.AspNetCore.Authorization;
using Microsoft.Extensions.Options;

namespace Partwise.Api.Credentials;

/// <summary>
/// Keys and roles: the <see cref="BearerKeyHandler"/> scheme, one authorization policy per role (named as the
/// role), and a fallback that needs a valid key, so that a route which declares nothing is not open by mistake.
/// </summary>
public static class CredentialsSetup
{
    /// <summary>Binds and validates <see cref="CredentialsOptions"/> at start and registers the scheme and the policies.</summary>
    public static IServiceCollection AddPartwiseCredentials(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<CredentialsOptions>().Bind(configuration.GetSection(CredentialsOptions.Section)).ValidateOnStart();
        services.AddSingleton<IValidateOptions<CredentialsOptions>, CredentialsOptionsValidator>();
        services.AddSingleton<KeyRing>();
        services.AddSingleton<IAuthorizationMiddlewareResultHandler, ForbiddenProblemResultHandler>();
        services.AddHostedService<CredentialsStartupLog>();
        // The core services only: AddAuthentication would also bring data protection, whose key ring is written to
        // disk at start, and no scheme here encrypts anything.
        services.AddWebEncoders();
        services.AddAuthenticationCore(options =>
        {
            options.DefaultScheme = BearerKeyHandler.SchemeName;
            options.AddScheme<BearerKeyHandler>(BearerKeyHandler.SchemeName, displayName: null);
        });
        services.AddAuthorization(options =>
        {
            var anyKey = new AuthorizationPolicyBuilder(BearerKeyHandler.SchemeName).RequireAuthenticatedUser().Build();
            options.DefaultPolicy = anyKey;
            options.FallbackPolicy = anyKey;
            foreach (var role in Roles.All)
            {
                options.AddPolicy(role, p => p.AddAuthenticationSchemes(BearerKeyHandler.SchemeName).RequireAuthenticatedUser().RequireRole(role));
            }
        });
        return services;
    }

    /// <summary>Authenticates every request and authorizes it against its endpoint's role; after routing, before the endpoints.</summary>
    public static IApplicationBuilder UsePartwiseCredentials(this IApplicationBuilder app) =>
        app.UseAuthentication().UseAuthorization();

    /// <summary>The endpoint needs a key holding <paramref name="role"/> (one of <see cref="Roles"/>; admin holds all).</summary>
    public static TBuilder RequireRole<TBuilder>(this TBuilder builder, string role)
        where TBuilder : IEndpointConventionBuilder
    {
        if (!Roles.IsKnown(role))
        {
            throw new ArgumentException($"'{role}' is not a role.", nameof(role));
        }

        return builder.RequireAuthorization(role)
            .ProducesProblem(StatusCodes.Status401Unauthorized)
            .ProducesProblem(StatusCodes.Status403Forbidden);
    }

    /// <summary>The endpoint takes any valid key, whatever its roles (the stateless compute endpoints).</summary>
    public static TBuilder RequireAnyKey<TBuilder>(this TBuilder builder)
        where TBuilder : IEndpointConventionBuilder =>
        builder.RequireAuthorization().ProducesProblem(StatusCodes.Status401Unauthorized);
}
