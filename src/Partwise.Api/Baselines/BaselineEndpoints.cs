using Microsoft.AspNetCore.Http.HttpResults;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Core.Problems;
using Partwise.Storage.Baselines;
using Serilog;

namespace Partwise.Api.Baselines;

/// <summary>Stored screening baselines: create (fit), list, read and retire.</summary>
public static class BaselineEndpoints
{
    /// <summary>The caution every baseline and screening description carries.</summary>
    public const string Caution =
        " Screening flags are statistical signals for review by a qualified analyst, not decisions: where results bear " +
        "on drinking water, food, health or safety, the user's accredited methods, local regulations and licensed " +
        "practice decide.";

    /// <summary>Maps <c>/v1/baselines</c> and <c>/v1/baselines/{id}</c>.</summary>
    public static RouteGroupBuilder MapBaselines(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("/v1/baselines").WithTags("Baselines")
            .ProducesProblem(StatusCodes.Status503ServiceUnavailable);

        group.MapPost("", Create)
            .RequireRole(Roles.Admin)
            .WithName("CreateBaseline")
            .WithSummary("Fit and store a screening baseline")
            .WithDescription(
                "Fits a baseline to reference samples: applies the zero policy, computes the coordinates (`ilr`, the " +
                "pivot basis, by default; or `ratios`, pairwise and balance log-ratios — an amalgamation is a 422 " +
                "`/problems/invalid-ratio` pointing at it, since it is not linear in the logs), estimates location and " +
                "scatter (`robust`: the reweighted minimum covariance determinant by FAST-MCD with a fixed seed, " +
                "Rousseeuw & Van Driessen 1999; `classical`: mean and covariance, n − 1) and sets the threshold " +
                "χ²_p(`cutoff`) on d² (default cutoff 0.975, strictly inside (0, 1), else 422 `/problems/invalid-option`). " +
                "Fewer than p + 1 reference samples is a 422 `/problems/too-few-samples`; a singular scatter (a constant " +
                "ratio, identical samples) a 422 `/problems/singular-scatter`; rules on unknown parts a 422 " +
                "`/problems/unknown-part`. `selection` coordinates are the pairwise ratios that stepwise selection " +
                "(Greenacre 2019, equal part weights) chooses on the reference samples, up to `maxRatios` or until " +
                "`explained` of the log-ratio variance is explained; `explained` is reported. Answers 201 with `Location` and the document, which is immutable; a refit under the same " +
                "`name` gets the next `version`. The zero policy is stored and applied to every screened sample. The " +
                "table also comes as text/csv with `name`, `description`, `scatter`, `cutoff` and the zero policy as " +
                "query parameters (ilr coordinates only)." + Caution)
            .ProducesTableProblems()
            .WithComputeLimits()
            .AcceptsTable<BaselineRequest>(
                BaselineExamples.Baseline,
                new CsvRequestMetadata(
                    "The reference samples: a header of part names (optional first column `id`), then one row per sample.",
                    BaselineExamples.BaselineCsv,
                    [
                        new CsvQueryParameter("name", "The baseline's name (JSON `name`); required."),
                        new CsvQueryParameter("description", "Free text (JSON `description`)."),
                        new CsvQueryParameter("coordinates", "Only `ilr` with a CSV body (JSON `coordinates.type`).", ["ilr"]),
                        new CsvQueryParameter("scatter", "`robust` (default) or `classical` (JSON `scatter`).", ["robust", "classical"]),
                        new CsvQueryParameter("cutoff", "The χ² quantile in (0, 1); default 0.975 (JSON `cutoff`).", IsNumber: true),
                        .. CsvQuery.ZeroPolicy,
                    ]));

        group.MapGet("", List)
            .RequireRole(Roles.Reader)
            .WithName("ListBaselines")
            .WithSummary("List the stored baselines")
            .WithDescription(
                "Every stored baseline document, the most recently created first, retired ones included (with " +
                "`retiredAt` set) unless `active=true`. Any other value of `active` is a 400 pointing at `/active`." + Caution)
            .ProducesProblem(StatusCodes.Status400BadRequest);

        group.MapGet("/{id}", Get)
            .RequireRole(Roles.Reader)
            .WithName("GetBaseline")
            .WithSummary("One baseline document")
            .WithDescription(
                "The baseline document as stored, with `retiredAt` (null while active). The document is portable: " +
                "posted as `baseline` to `POST /v1/screenings` it screens the same with nothing stored. A retired baseline " +
                "is still returned (screening it gives 410). An unknown id is a 404 `/problems/not-found`." + Caution)
            .ProducesProblem(StatusCodes.Status404NotFound);

        group.MapBiplot();

        group.MapDelete("/{id}", Retire)
            .RequireRole(Roles.Admin)
            .WithName("RetireBaseline")
            .WithSummary("Retire a baseline")
            .WithDescription(
                "Retires the baseline: 204, and screening it then gives 410 `/problems/baseline-retired`. Retiring " +
                "again is a 204 too (the first time is kept). The document, its screenings and its flags are kept and " +
                "can still be read. An unknown id is a 404 `/problems/not-found`.")
            .ProducesProblem(StatusCodes.Status404NotFound);

        return group;
    }

    /// <summary>Fits the baseline and stores it.</summary>
    /// <param name="request">The reference samples and options.</param>
    /// <param name="store">The store.</param>
    /// <param name="log">The request's completion event.</param>
    /// <param name="http">The request, whose compute timeout ends once the fit is done.</param>
    /// <param name="cancellationToken">The request's cancellation: the compute timeout or a caller that goes away stops the fit.</param>
    public static async Task<Results<Created<BaselineDocument>, ProblemHttpResult>> Create(BaselineRequest request, StoreAccess store, IDiagnosticContext log, HttpContext http, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(store);
        PendingBaseline pending;
        try
        {
            pending = PartwiseMetrics.TimeBaselineFit(() => BaselineFitting.Fit(request, cancellationToken));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }

        // Once fitted, storing is not cut off by the timeout: a caller answered "timeout" must know nothing was stored.
        ComputeLimits.EndTimeout(http);

        log.DescribeTable(pending.Table);
        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        BaselineDocument? stored = null;
        var record = await storage.Baselines.CreateAsync(
            pending.Name,
            stamp =>
            {
                stored = pending.Stamp(stamp.Id, stamp.Version, stamp.CreatedAt);
                return BaselineJson.Write(stored);
            },
            cancellationToken).ConfigureAwait(false);
        log.Set("BaselineId", record.Id);
        return TypedResults.Created($"/v1/baselines/{Uri.EscapeDataString(record.Id)}", stored! with { RetiredAt = null });
    }

    /// <summary>Lists the baselines.</summary>
    /// <param name="active">true: only baselines that take screenings; absent or false: all.</param>
    /// <param name="store">The store.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<Ok<BaselineListResponse>, ProblemHttpResult>> List(string? active, StoreAccess store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        bool activeOnly;
        switch (active)
        {
            case null or "false":
                activeOnly = false;
                break;
            case "true":
                activeOnly = true;
                break;
            default:
                return ProblemCatalog.ToResult(new CompositionException(ProblemTypes.InvalidInput, "/active", "The query parameter 'active' is true or false."));
        }

        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        var records = await storage.Baselines.ListAsync(activeOnly, cancellationToken).ConfigureAwait(false);
        return TypedResults.Ok(new BaselineListResponse([.. records.Select(ToDocument)]));
    }

    /// <summary>Reads one baseline.</summary>
    /// <param name="id">The baseline's id.</param>
    /// <param name="store">The store.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<Ok<BaselineDocument>, ProblemHttpResult>> Get(string id, StoreAccess store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        var record = await storage.Baselines.GetAsync(id, cancellationToken).ConfigureAwait(false);
        return record is null ? NotFound(id) : TypedResults.Ok(ToDocument(record));
    }

    /// <summary>Retires one baseline.</summary>
    /// <param name="id">The baseline's id.</param>
    /// <param name="store">The store.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<NoContent, ProblemHttpResult>> Retire(string id, StoreAccess store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        return await storage.Baselines.RetireAsync(id, cancellationToken).ConfigureAwait(false) ? TypedResults.NoContent() : NotFound(id);
    }

    /// <summary>The 404 for an unknown baseline id.</summary>
    public static ProblemHttpResult NotFound(string id) =>
        ProblemCatalog.ToResult(new CompositionException(ProblemTypes.NotFound, "", $"There is no baseline with id '{id}'."));

    /// <summary>The stored document with its retirement time.</summary>
    public static BaselineDocument ToDocument(BaselineRecord record)
    {
        ArgumentNullException.ThrowIfNull(record);
        return BaselineJson.Read<BaselineDocument>(record.DocumentJson) with { RetiredAt = record.RetiredAt };
    }
}

/// <summary>The stored baselines.</summary>
/// <param name="Items">The documents, the most recently created first.</param>
public sealed record BaselineListResponse(IReadOnlyList<BaselineDocument> Items);
