using System.Globalization;
using Microsoft.Extensions.Options;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Graceful shutdown, bound from <c>Partwise:Shutdown</c>. On SIGTERM (or Ctrl+C) the server stops taking connections
/// and waits up to <see cref="TimeoutSeconds"/> for the requests in flight, so that screenings already received
/// finish and are committed before the process ends; then hosted services stop within what is left of the time.
/// </summary>
public sealed class ShutdownOptions
{
    /// <summary>The configuration section the shutdown settings are bound from.</summary>
    public const string Section = "Partwise:Shutdown";

    /// <summary>How long a stop waits for requests in flight and for hosted services, in seconds (default 20; fractions allowed).</summary>
    public double TimeoutSeconds { get; set; } = 20;
}

/// <summary>Rejects a shutdown timeout that is not a positive number of seconds within an hour.</summary>
public sealed class ShutdownOptionsValidator : IValidateOptions<ShutdownOptions>
{
    /// <inheritdoc />
    public ValidateOptionsResult Validate(string? name, ShutdownOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        return options.TimeoutSeconds is > 0 and <= 3600
            ? ValidateOptionsResult.Success
            : ValidateOptionsResult.Fail(string.Create(CultureInfo.InvariantCulture, $"{ShutdownOptions.Section}:TimeoutSeconds must be more than 0 and at most 3600; it is {options.TimeoutSeconds}."));
    }
}

/// <summary>Registers the shutdown settings.</summary>
public static class ShutdownSetup
{
    /// <summary>Binds and validates <see cref="ShutdownOptions"/> at start and gives the host their timeout.</summary>
    public static IServiceCollection AddPartwiseShutdown(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<ShutdownOptions>().Bind(configuration.GetSection(ShutdownOptions.Section)).ValidateOnStart();
        services.AddSingleton<IValidateOptions<ShutdownOptions>, ShutdownOptionsValidator>();
        services.AddOptions<HostOptions>().Configure<IOptions<ShutdownOptions>>((host, shutdown) =>
            host.ShutdownTimeout = TimeSpan.FromSeconds(shutdown.Value.TimeoutSeconds));
        return services;
    }
}
