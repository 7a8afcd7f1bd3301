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
    public static WebApplicationBuilder AddPartwiseLogging(this WebApplicationBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
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
