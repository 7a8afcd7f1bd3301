using System.Text.Json.Serialization;
using Microsoft.AspNetCore.Server.Kestrel.Core;
using Microsoft.Extensions.Options;

namespace Partwise.Api.Infrastructure;

/// <summary>Service registrations of the host's plumbing, one method per concern, so that Program.cs reads as a list.</summary>
public static class ServiceSetup
{
    /// <summary>
    /// Binds and validates <see cref="LimitsOptions"/> at start, gives Kestrel the same body limit, and registers the
    /// compute timeout, the rate limits and the shutdown timeout.
    /// </summary>
    public static IServiceCollection AddPartwiseLimits(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<LimitsOptions>().Bind(configuration.GetSection(LimitsOptions.Section)).ValidateOnStart();
        services.AddSingleton<IValidateOptions<LimitsOptions>, LimitsOptionsValidator>();
        services.AddOptions<KestrelServerOptions>().Configure<IOptions<LimitsOptions>>((kestrel, limits) =>
            kestrel.Limits.MaxRequestBodySize = limits.Value.MaxBodyBytes);
        services.AddPartwiseComputeTimeout();
        services.AddPartwiseRateLimits(configuration);
        services.AddPartwiseShutdown(configuration);
        return services;
    }

    /// <summary>Problem documents for exceptions and bodiless error statuses.</summary>
    public static IServiceCollection AddPartwiseProblems(this IServiceCollection services)
    {
        services.AddProblemDetails(options => options.CustomizeProblemDetails = context =>
            context.ProblemDetails.Extensions.Remove("traceId"));
        services.AddExceptionHandler<ProblemExceptionHandler>();
        return services;
    }

    /// <summary>Response JSON: camelCase, numbers as JSON numbers, nulls left out.</summary>
    public static IServiceCollection AddPartwiseJson(this IServiceCollection services) =>
        services.ConfigureHttpJsonOptions(options =>
        {
            options.SerializerOptions.NumberHandling = JsonNumberHandling.Strict;
            options.SerializerOptions.DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull;
        });
}
