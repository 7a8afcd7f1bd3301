using System.Globalization;
using System.Threading.RateLimiting;
using Microsoft.AspNetCore.RateLimiting;
using Microsoft.Extensions.Options;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Per-caller token buckets (ASP.NET Core's rate limiter) for the screening routes and the compute routes. A caller is
/// its key name (<c>HttpContext.User.Identity.Name</c>, set by authentication) or, without one, its remote IP address.
/// Over the limit the answer is a 429 <c>/problems/rate-limited</c> with <c>Retry-After</c> in whole seconds.
/// </summary>
public static class RateLimits
{
    /// <summary>The policy of <c>POST /v1/baselines/{id}/screenings</c> and <c>POST /v1/screenings</c>.</summary>
    public const string ScreeningPolicy = "screening";

    /// <summary>The policy of the compute routes.</summary>
    public const string ComputePolicy = "compute";

    // The bucket refills in steps of at least this long, so that a high rate does not run a timer every millisecond.
    private static readonly TimeSpan ShortestRefill = TimeSpan.FromMilliseconds(100);

    /// <summary>Binds and validates <see cref="RateLimitsOptions"/> at start and registers both policies.</summary>
    public static IServiceCollection AddPartwiseRateLimits(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<RateLimitsOptions>().Bind(configuration.GetSection(RateLimitsOptions.Section)).ValidateOnStart();
        services.AddSingleton<IValidateOptions<RateLimitsOptions>, RateLimitsOptionsValidator>();
        services.AddRateLimiter(_ => { });
        services.AddOptions<RateLimiterOptions>().Configure<IOptions<RateLimitsOptions>>((options, limits) =>
        {
            options.AddPolicy(ScreeningPolicy, context => Partition(context, limits.Value.Screening));
            options.AddPolicy(ComputePolicy, context => Partition(context, limits.Value.Compute));
            options.RejectionStatusCode = StatusCodes.Status429TooManyRequests;
            options.OnRejected = Reject;
        });
        return services;
    }

    /// <summary>The caller a request counts against: <c>key:name</c> when authenticated, else <c>ip:address</c>.</summary>
    public static string CallerOf(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (context.User.Identity?.Name is { Length: > 0 } name)
        {
            return "key:" + name;
        }

        return "ip:" + (context.Connection.RemoteIpAddress?.ToString() ?? "unknown");
    }

    /// <summary>
    /// The token bucket for one rate: it holds <see cref="RateLimitSettings.Burst"/> tokens and gains t tokens every
    /// t / r seconds for the rate r, with t the least whole number that makes the step at least 100 ms but no more than
    /// the bucket holds, so the rate is exact. No queue: a request without a token is refused at once.
    /// </summary>
    public static TokenBucketRateLimiterOptions BucketOf(RateLimitSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        var rate = settings.PermitsPerSecond;
        var tokens = Math.Max(1, (int)Math.Ceiling(rate * ShortestRefill.TotalSeconds - 1e-9));
        return new TokenBucketRateLimiterOptions
        {
            TokenLimit = settings.Burst,
            TokensPerPeriod = Math.Min(tokens, settings.Burst),
            ReplenishmentPeriod = TimeSpan.FromSeconds(Math.Min(tokens, settings.Burst) / rate),
            QueueLimit = 0,
            AutoReplenishment = true,
        };
    }

    private static RateLimitPartition<string> Partition(HttpContext context, RateLimitSettings settings) =>
        settings.IsUnlimited
            ? RateLimitPartition.GetNoLimiter(CallerOf(context))
            : RateLimitPartition.GetTokenBucketLimiter(CallerOf(context), _ => BucketOf(settings));

    private static async ValueTask Reject(OnRejectedContext rejected, CancellationToken cancellationToken)
    {
        var http = rejected.HttpContext;
        var seconds = rejected.Lease.TryGetMetadata(MetadataName.RetryAfter, out var retryAfter)
            ? Math.Max(1, (int)Math.Ceiling(retryAfter.TotalSeconds))
            : 1;
        http.Response.Headers.RetryAfter = seconds.ToString(CultureInfo.InvariantCulture);
        var problem = ProblemCatalog.Create(
            ProblemTypes.RateLimited,
            string.Create(CultureInfo.InvariantCulture, $"This caller has made more requests to this kind of route than its rate limit allows; retry after {seconds} s (the Retry-After header)."),
            []);
        await TypedResults.Problem(problem).ExecuteAsync(http).ConfigureAwait(false);
    }
}
