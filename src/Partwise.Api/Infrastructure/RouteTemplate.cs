using Microsoft.AspNetCore.Diagnostics;

namespace Partwise.Api.Infrastructure;

/// <summary>The route template and the name of the endpoint a request reached, for logs and metrics (never the raw path).</summary>
public static class RouteTemplate
{
    /// <summary>The endpoint of the request; after an exception the handler has cleared it, but its feature still knows it.</summary>
    public static Endpoint? EndpointOf(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        return context.GetEndpoint() ?? context.Features.Get<IExceptionHandlerFeature>()?.Endpoint;
    }

    /// <summary>
    /// The route template such as <c>/v1/baselines/{id}/screenings</c>, as the OpenAPI document writes it (a group's
    /// own route, stored as <c>/v1/baselines/</c>, without its trailing slash); null when no route matched.
    /// </summary>
    public static string? Of(HttpContext context) =>
        (EndpointOf(context) as RouteEndpoint)?.RoutePattern.RawText is { } template
            ? template.Length > 1 ? template.TrimEnd('/') : template
            : null;
}
