using Prometheus;
using Prometheus.HttpMetrics;

namespace Partwise.Api.Infrastructure.Metrics;

/// <summary>
/// <c>/metrics</c> in the Prometheus text format, without credentials, and the HTTP metrics of every other request:
/// <c>http_requests_received_total</c> and the <c>http_request_duration_seconds</c> histogram by <c>code</c>,
/// <c>method</c> and <c>endpoint</c> (the route template such as <c>/v1/baselines/{id}/screenings</c>, never the
/// raw path, so ids never become label values; empty when no route matched), and
/// <c>http_requests_in_progress</c>. The process's own metrics (<c>process_*</c>, <c>dotnet_*</c>) come with the
/// library.
/// </summary>
public static class MetricsSetup
{
    /// <summary>The route of the scrape.</summary>
    public const string Path = "/metrics";

    private static readonly string[] RequestLabels = [HttpRequestLabelNames.Code, HttpRequestLabelNames.Method, HttpRequestLabelNames.Endpoint];

    /// <summary>
    /// Adds the HTTP metrics. Put it before the exception handler, so that a request that failed is counted with the
    /// status it was answered with; the scrape itself is left out.
    /// </summary>
    public static IApplicationBuilder UsePartwiseMetrics(this IApplicationBuilder app) =>
        app.UseHttpMetrics(options =>
        {
            options.CaptureMetricsUrl = false;
            // The default endpoint label reads the endpoint after the request, when the exception handler has cleared it.
            options.AddCustomLabel(HttpRequestLabelNames.Endpoint, context => RouteTemplate.Of(context) ?? "");
            options.RequestCount.Counter = Prometheus.Metrics.CreateCounter(
                "http_requests_received_total", "HTTP requests answered, by status code, method and route template.", RequestLabels);
            options.RequestDuration.Histogram = Prometheus.Metrics.CreateHistogram(
                "http_request_duration_seconds",
                "Time to answer HTTP requests, by status code, method and route template.",
                new HistogramConfiguration { LabelNames = RequestLabels, Buckets = Histogram.ExponentialBuckets(0.001, 2, 16) });
            options.InProgress.Gauge = Prometheus.Metrics.CreateGauge(
                "http_requests_in_progress", "HTTP requests being answered, by method and route template.", [HttpRequestLabelNames.Method, HttpRequestLabelNames.Endpoint]);
        });

    /// <summary>Maps <c>GET /metrics</c>; it needs no credentials.</summary>
    public static IEndpointConventionBuilder MapPartwiseMetrics(this IEndpointRouteBuilder app) => app.MapMetrics(Path);
}
