using Microsoft.AspNetCore.Http.HttpResults;

namespace Partwise.Api.Health;

/// <summary>Liveness for orchestrators and load balancers.</summary>
public static class HealthEndpoints
{
    /// <summary>Maps <c>GET /healthz</c>.</summary>
    public static RouteGroupBuilder MapHealth(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("").WithTags("Operations");
        group.MapGet("/healthz", Alive)
            .WithName("GetHealth")
            .WithSummary("Is the process alive?")
            .WithDescription("Answers 200 `{\"status\": \"ok\"}` while the process serves requests. It checks nothing else and needs no credentials.");
        return group;
    }

    /// <summary>The process is alive.</summary>
    public static Ok<HealthResponse> Alive() => TypedResults.Ok(new HealthResponse("ok"));
}

/// <summary>The liveness answer.</summary>
/// <param name="Status">Always <c>ok</c>.</param>
public sealed record HealthResponse(string Status);
