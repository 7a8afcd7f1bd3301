using System.Globalization;
using Microsoft.AspNetCore.Http.Metadata;
using Microsoft.AspNetCore.Http.Timeouts;
using Microsoft.Extensions.Options;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// The rules shared by the compute routes: the per-caller compute rate limit and a request timeout
/// (<c>Partwise:Limits:ComputeTimeoutSeconds</c>, ASP.NET Core's request timeouts). The timeout cancels the request's
/// token, which the handlers hand to the math library's loops, so the work stops; the answer is a 503
/// <c>/problems/timeout</c>. A caller that disconnects cancels the same token.
/// </summary>
public static class ComputeLimits
{
    /// <summary>The request timeout policy of the compute routes.</summary>
    public const string TimeoutPolicy = "compute";

    /// <summary>Registers the request timeouts with the compute policy, its length read from <see cref="LimitsOptions"/>.</summary>
    public static IServiceCollection AddPartwiseComputeTimeout(this IServiceCollection services)
    {
        services.AddRequestTimeouts();
        services.AddOptions<RequestTimeoutOptions>().Configure<IOptions<LimitsOptions>>((options, limits) =>
            options.AddPolicy(TimeoutPolicy, new RequestTimeoutPolicy
            {
                Timeout = limits.Value.ComputeTimeoutSeconds > 0 ? TimeSpan.FromSeconds(limits.Value.ComputeTimeoutSeconds) : null,
                TimeoutStatusCode = StatusCodes.Status503ServiceUnavailable,
                WriteTimeoutResponse = WriteTimeout,
            }));
        return services;
    }

    /// <summary>What the compute limits add to a route's description.</summary>
    public const string ComputeDescription =
        "\n\nLimits: each caller (its key, else its address) has a token bucket of `Partwise:RateLimits:Compute` " +
        "(default 1,000 requests per second, bursts of 2,000) shared by the compute routes; over it the answer is 429 " +
        "`/problems/rate-limited` with `Retry-After` in seconds. A computation that runs longer than " +
        "`Partwise:Limits:ComputeTimeoutSeconds` (default 30 s) is stopped and answered 503 `/problems/timeout`; a " +
        "caller that disconnects stops it too.";

    /// <summary>What the screening limit adds to a route's description.</summary>
    public const string ScreeningDescription =
        "\n\nLimits: each caller (its key, else its address) has a token bucket of `Partwise:RateLimits:Screening` " +
        "(default 1,000 requests per second, bursts of 2,000) shared by both screening routes; over it the answer is 429 " +
        "`/problems/rate-limited` with `Retry-After` in seconds, and nothing of the request is screened or stored.";

    /// <summary>
    /// The compute rate limit and timeout on a route or group, with the 429 and 503 answers and a sentence on them in
    /// the route's description for the OpenAPI document.
    /// </summary>
    public static TBuilder WithComputeLimits<TBuilder>(this TBuilder builder)
        where TBuilder : IEndpointConventionBuilder
    {
        builder
            .RequireRateLimiting(RateLimits.ComputePolicy)
            .WithRequestTimeout(TimeoutPolicy)
            .ProducesProblem(StatusCodes.Status429TooManyRequests)
            .ProducesProblem(StatusCodes.Status503ServiceUnavailable);
        builder.Finally(endpoint => AppendDescription(endpoint, ComputeDescription));
        return builder;
    }

    /// <summary>The screening rate limit on a route, with its 429 answer and a sentence on it in the route's description.</summary>
    public static TBuilder WithScreeningLimits<TBuilder>(this TBuilder builder)
        where TBuilder : IEndpointConventionBuilder
    {
        builder
            .RequireRateLimiting(RateLimits.ScreeningPolicy)
            .ProducesProblem(StatusCodes.Status429TooManyRequests);
        builder.Finally(endpoint => AppendDescription(endpoint, ScreeningDescription));
        return builder;
    }

    /// <summary>
    /// Ends the request's timeout: for work after which cancelling would leave the caller not knowing what happened
    /// (a baseline being stored once it is fitted). A caller that disconnects still cancels.
    /// </summary>
    public static void EndTimeout(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        context.Features.Get<IHttpRequestTimeoutFeature>()?.DisableTimeout();
    }

    // Runs after the route's own conventions (Finally), so the route's description is there to extend.
    private static void AppendDescription(EndpointBuilder endpoint, string text)
    {
        var description = endpoint.Metadata.OfType<IEndpointDescriptionMetadata>().LastOrDefault()?.Description;
        if (description is not null)
        {
            endpoint.Metadata.Add(new EndpointDescriptionAttribute(description + text));
        }
    }

    private static Task WriteTimeout(HttpContext context)
    {
        var seconds = context.RequestServices.GetRequiredService<IOptions<LimitsOptions>>().Value.ComputeTimeoutSeconds;
        var problem = ProblemCatalog.Create(
            ProblemTypes.Timeout,
            string.Create(CultureInfo.InvariantCulture, $"The computation took longer than {seconds:0.###} s, the most allowed, and was stopped; nothing was stored. Send a smaller table or fewer steps."),
            []);
        return TypedResults.Problem(problem).ExecuteAsync(context);
    }
}
