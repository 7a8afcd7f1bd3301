using System.Globalization;
using Microsoft.Extensions.Options;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Per-caller rate limits, bound from <c>Partwise:RateLimits</c>: one token bucket per caller for screening and one for
/// the compute routes. The defaults sit above what one caller sending one request at a time gets from a small (2-core)
/// machine, so that they stop a runaway client without throttling an instrument, a pipeline or the reference checks;
/// lower them where callers share a service. The load script turns them off, to measure the service alone.
/// </summary>
public sealed class RateLimitsOptions
{
    /// <summary>The configuration section the rate limits are bound from.</summary>
    public const string Section = "Partwise:RateLimits";

    /// <summary><c>POST /v1/baselines/{id}/screenings</c> and <c>POST /v1/screenings</c>: 1,000 per second, bursts of 2,000.</summary>
    public RateLimitSettings Screening { get; set; } = new() { PermitsPerSecond = 1_000, Burst = 2_000 };

    /// <summary>The compute routes (coordinates, inverse, prepare, summary, distances, lra, ratio selection and sets, baseline fits): 1,000 per second, bursts of 2,000.</summary>
    public RateLimitSettings Compute { get; set; } = new() { PermitsPerSecond = 1_000, Burst = 2_000 };
}

/// <summary>One token bucket: <see cref="PermitsPerSecond"/> tokens refill it up to <see cref="Burst"/>; a request takes one.</summary>
public sealed class RateLimitSettings
{
    /// <summary>The sustained rate per caller, in requests per second (0.001 to 1,000,000, fractions allowed); 0 turns the limit off.</summary>
    public double PermitsPerSecond { get; set; }

    /// <summary>The most requests a caller may make at once after a quiet spell (the bucket's size); at least 1 when limited.</summary>
    public int Burst { get; set; }

    /// <summary>True when <see cref="PermitsPerSecond"/> is 0: no limit.</summary>
    public bool IsUnlimited => PermitsPerSecond == 0;
}

/// <summary>Rejects rate limits that are negative, not finite or leave no room for a single request.</summary>
public sealed class RateLimitsOptionsValidator : IValidateOptions<RateLimitsOptions>
{
    /// <inheritdoc />
    public ValidateOptionsResult Validate(string? name, RateLimitsOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var failures = new List<string>();
        Check(options.Screening, "Screening", failures);
        Check(options.Compute, "Compute", failures);
        return failures.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(failures);
    }

    private static void Check(RateLimitSettings? settings, string name, List<string> failures)
    {
        var at = $"{RateLimitsOptions.Section}:{name}";
        if (settings is null)
        {
            failures.Add($"{at} must be a section with PermitsPerSecond and Burst.");
            return;
        }

        // Below one request per 1,000 s the bucket's refill timer would exceed what a timer can wait; beyond a million per
        // second a limit means nothing.
        var rate = settings.PermitsPerSecond;
        if (!double.IsFinite(rate) || (rate != 0 && rate is < 0.001 or > 1_000_000))
        {
            failures.Add(string.Create(CultureInfo.InvariantCulture, $"{at}:PermitsPerSecond must be 0 (no limit) or between 0.001 and 1,000,000; it is {rate}."));
        }

        if (!settings.IsUnlimited && settings.Burst < 1)
        {
            failures.Add(string.Create(CultureInfo.InvariantCulture, $"{at}:Burst must be at least 1 when PermitsPerSecond is set; it is {settings.Burst}."));
        }
    }
}
