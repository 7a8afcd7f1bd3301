using Serilog;
using Serilog.Events;
using Serilog.Formatting.Compact;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Structured logs: compact JSON events on stdout, one completion event per request (method, route, status,
/// elapsed, request id, and the shape fields handlers add such as PartCount and RowCount), and never the values
/// a caller sent. The framework's own per-request logs are quieted to warnings.
/// </summary>
public static class RequestLogging
{
    /// <summary>
    /// Configures Serilog from the <c>Serilog</c> configuration section over the defaults here; sinks and enrichers
    /// registered as services are added too. The static <c>Log.Logger</c> is left alone: each host (several run in
    /// one test process) logs through its own logger.
    /// </summary>
    /// <exception cref="InvalidOperationException">A level under <c>Serilog:MinimumLevel</c> is not a Serilog level.</exception>
    public static WebApplicationBuilder AddPartwiseLogging(this WebApplicationBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        if (LevelProblems(builder.Configuration) is { Count: > 0 } problems)
        {
            throw new InvalidOperationException(string.Join(" ", problems));
        }

        builder.Services.AddSerilog((services, configuration) => configuration
            .MinimumLevel.Information()
            .MinimumLevel.Override("Microsoft.AspNetCore", LogEventLevel.Warning)
            .MinimumLevel.Override("Microsoft.Hosting.Lifetime", LogEventLevel.Information)
            .ReadFrom.Configuration(builder.Configuration)
            .ReadFrom.Services(services)
            .Enrich.FromLogContext()
            .WriteTo.Console(new RenderedCompactJsonFormatter()),
            preserveStaticLogger: true);
        return builder;
    }

    /// <summary>
    /// The levels under <c>Serilog:MinimumLevel</c> (one level, or <c>Default</c> and <c>Override:{source}</c>) that
    /// are not Serilog levels, each named with its setting; Serilog's own error would not say which setting it read.
    /// </summary>
    public static IReadOnlyList<string> LevelProblems(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var section = configuration.GetSection("Serilog:MinimumLevel");
        IEnumerable<IConfigurationSection> levels = section.Value is not null
            ? [section]
            : [section.GetSection("Default"), .. section.GetSection("Override").GetChildren()];
        return [.. levels
            // A value starting with '$' names a level switch of Serilog's own settings.
            .Where(s => s.Value is { Length: > 0 } value && value[0] != '$' && !(Enum.TryParse<LogEventLevel>(value, ignoreCase: true, out var level) && Enum.IsDefined(level)))
            .Select(s => $"{s.Path} is '{s.Value}', not a log level: Verbose, Debug, Information, Warning, Error or Fatal.")];
    }

    /// <summary>Adds the completion event; put it after <see cref="RequestId.UseRequestId"/> and before the exception handler.</summary>
    public static IApplicationBuilder UsePartwiseRequestLogging(this IApplicationBuilder app) =>
        app.UseSerilogRequestLogging(options =>
        {
            options.Logger = app.ApplicationServices.GetRequiredService<Serilog.ILogger>();
            options.MessageTemplate = "HTTP {RequestMethod} {RequestPath} responded {StatusCode} in {Elapsed:0.0} ms";
            options.GetLevel = static (context, _, exception) =>
                exception is not null || context.Response.StatusCode >= 500 ? LogEventLevel.Error : LogEventLevel.Information;
            options.EnrichDiagnosticContext = static (diagnostics, context) =>
            {
                diagnostics.Set("RequestId", context.TraceIdentifier);
                diagnostics.Set("Route", RouteTemplate.Of(context));
                if (context.User.Identity?.Name is { } key)
                {
                    // The caller's key name as the credentials' handler set it; never the Authorization header.
                    diagnostics.Set("key", key);
                }

                diagnostics.Set("RequestContentType", context.Request.ContentType);
                diagnostics.Set("ResponseContentType", context.Response.ContentType);
            };
        });
}
