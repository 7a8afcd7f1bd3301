using Microsoft.AspNetCore.Http.HttpResults;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Storage;

namespace Partwise.Api.Health;

/// <summary>Liveness for orchestrators and load balancers.</summary>
public static class HealthEndpoints
{
    /// <summary>The readiness route's name, its operation in the OpenAPI document and in the storage error metric.</summary>
    public const string ReadinessName = "GetReadiness";

    /// <summary>Maps <c>GET /healthz</c>.</summary>
    public static RouteGroupBuilder MapHealth(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("").WithTags("Operations").AllowAnonymous();
        group.MapGet("/healthz", Alive)
            .WithName("GetHealth")
            .WithSummary("Is the process alive?")
            .WithDescription("Answers 200 `{\"status\": \"ok\"}` while the process serves requests. It checks nothing else and needs no credentials.");
        group.MapGet("/readyz", Ready)
            .WithName(ReadinessName)
            .WithSummary("Can the service reach its storage?")
            .WithDescription("Answers 200 `{\"status\": \"ready\"}` when the database answers and its schema is migrated (a migration that failed at start is tried again here), else 503 `/problems/storage-unavailable`. Needs no credentials.")
            .ProducesProblem(StatusCodes.Status503ServiceUnavailable);
        return group;
    }

    /// <summary>The process is alive.</summary>
    public static Ok<HealthResponse> Alive() => TypedResults.Ok(new HealthResponse("ok"));

    /// <summary>The storage is reachable and migrated.</summary>
    /// <param name="store">The store.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<Ok<HealthResponse>, ProblemHttpResult>> Ready(StoreAccess store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        try
        {
            var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
            await storage.PingAsync(cancellationToken).ConfigureAwait(false);
            return TypedResults.Ok(new HealthResponse("ready"));
        }
        catch (StorageUnavailableException)
        {
            PartwiseMetrics.StorageUnavailable(ReadinessName);
            return TypedResults.Problem(StorageProblem.Details());
        }
    }
}

/// <summary>The liveness answer.</summary>
/// <param name="Status"><c>ok</c> (alive) or <c>ready</c> (storage reachable).</param>
public sealed record HealthResponse(string Status);
