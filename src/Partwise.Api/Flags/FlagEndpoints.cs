using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Net.Http.Headers;
using Partwise.Api.Baselines;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Core.Problems;
using Partwise.Storage.Flags;
using Serilog;

namespace Partwise.Api.Flags;

/// <summary>Flags raised by screenings: listing with cursors, ETags and long polling, and review.</summary>
public static class FlagEndpoints
{
    /// <summary>The longest wait of a long poll.</summary>
    public const int MaxWaitSeconds = 30;

    /// <summary>Maps <c>GET /v1/flags</c> and <c>POST /v1/flags/{id}/review</c>.</summary>
    public static RouteGroupBuilder MapFlags(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("/v1/flags").WithTags("Flags").ProducesProblem(StatusCodes.Status503ServiceUnavailable);

        group.MapGet("", List)
            .RequireRole(Roles.Reader)
            .WithName("ListFlags")
            .WithSummary("List flags, or wait for new ones")
            .WithDescription(
                "Flags in the order they were committed, filtered by `baseline` (an id) and `status` (`open` by default, " +
                "`confirmed`, `dismissed` or `any`), `limit` per page (1 to 500, default 100), resuming `after` a " +
                "cursor (the `next` of the previous page: following it never skips or repeats a flag). The response " +
                "has an `ETag` that changes whenever any flag is raised or reviewed; a matching `If-None-Match` is " +
                "answered 304 with no body. `waitSeconds` (0 to 30) makes it a long poll: with a matching " +
                "`If-None-Match` the answer waits until the ETag would change (then 200) or the time is up (then 304); " +
                "without one, an empty page waits for the first change and answers the page then, or the unchanged " +
                "page at the timeout. Bad query parameters are 400 `/problems/invalid-input` whose pointer names the " +
                "parameter as if the query were a JSON object (`/after`, `/limit`, `/waitSeconds`, `/status`): a " +
                "malformed cursor, a limit outside 1 to 500 or a wait over 30 s are refused, not clamped. Flags are " +
                "statistical signals for review by a qualified analyst, not decisions.")
            .Produces(StatusCodes.Status304NotModified)
            .ProducesProblem(StatusCodes.Status400BadRequest);

        group.MapPost("/{id}/review", Review)
            .RequireRole(Roles.Reviewer)
            .WithName("ReviewFlag")
            .WithSummary("Record an analyst's review of a flag")
            .WithDescription(
                "Sets the flag's `status` to `confirmed` or `dismissed` with an optional `note` and `reviewer`, " +
                "replacing an earlier review, and answers the flag. A status other than those is a 400; an unknown " +
                "flag a 404 `/problems/not-found`. The review records an analyst's judgement; the service makes none.")
            .WithMetadata(new JsonRequestMetadata(typeof(ReviewRequest), BaselineExamples.Review))
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status404NotFound)
            .ProducesProblem(StatusCodes.Status413PayloadTooLarge)
            .ProducesProblem(StatusCodes.Status415UnsupportedMediaType);

        return group;
    }

    /// <summary>One page of flags.</summary>
    /// <param name="baseline">Only flags of this baseline id.</param>
    /// <param name="status"><c>open</c> (default), <c>confirmed</c>, <c>dismissed</c> or <c>any</c>.</param>
    /// <param name="after">A cursor: the <c>next</c> of an earlier page.</param>
    /// <param name="limit">The page size, an integer from 1 to 500; default 100.</param>
    /// <param name="waitSeconds">Long poll: wait up to this many seconds (an integer from 0 to 30) for a change.</param>
    /// <param name="context">The request, for <c>If-None-Match</c> and the <c>ETag</c>.</param>
    /// <param name="store">The store.</param>
    /// <param name="log">The request's completion event.</param>
    public static async Task<Results<Ok<FlagPageResponse>, StatusCodeHttpResult, ProblemHttpResult>> List(
        string? baseline,
        string? status,
        string? after,
        string? limit,
        string? waitSeconds,
        HttpContext context,
        StoreAccess store,
        IDiagnosticContext log)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(store);
        FlagQuery query;
        int wait;
        try
        {
            (query, wait) = ReadQuery(baseline, status, after, limit, waitSeconds);
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }

        var cancellationToken = context.RequestAborted;
        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        var flags = storage.Flags;
        var page = await flags.ListAsync(query, cancellationToken).ConfigureAwait(false);
        var etag = ETagOf(page.Token, query);
        var matches = Matches(context.Request, etag);
        if (wait > 0 && (matches || page.Items.Count == 0))
        {
            var changed = await flags.WaitForChangeAsync(page.Token, TimeSpan.FromSeconds(wait), cancellationToken).ConfigureAwait(false);
            if (changed != page.Token)
            {
                page = await flags.ListAsync(query, cancellationToken).ConfigureAwait(false);
                etag = ETagOf(page.Token, query);
                matches = Matches(context.Request, etag);
            }
        }

        context.Response.Headers.ETag = etag;
        context.Response.Headers.CacheControl = "no-cache";
        log.Set("FlagCount", page.Items.Count);
        if (matches)
        {
            return TypedResults.StatusCode(StatusCodes.Status304NotModified);
        }

        return TypedResults.Ok(new FlagPageResponse([.. page.Items.Select(FlagItem.From)], page.Next?.ToString(), page.HasMore));
    }

    /// <summary>Records a review.</summary>
    /// <param name="id">The flag's id.</param>
    /// <param name="request">The review.</param>
    /// <param name="store">The store.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<Ok<FlagItem>, ProblemHttpResult>> Review(string id, ReviewRequest request, StoreAccess store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(store);
        if (!FlagStatusNames.TryParseStatus(request.Status, out var status) || status == FlagStatus.Open)
        {
            return ProblemCatalog.ToResult(new CompositionException(ProblemTypes.InvalidInput, "/status", "A review needs \"status\": confirmed or dismissed."));
        }

        if (request.Note is { Length: > 2_000 })
        {
            return ProblemCatalog.ToResult(new CompositionException(ProblemTypes.InvalidInput, "/note", "The note has at most 2,000 characters."));
        }

        if (request.Reviewer is { Length: > 200 })
        {
            return ProblemCatalog.ToResult(new CompositionException(ProblemTypes.InvalidInput, "/reviewer", "The reviewer has at most 200 characters."));
        }

        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        var flag = await storage.Flags.ReviewAsync(id, status, request.Note, request.Reviewer, cancellationToken).ConfigureAwait(false);
        return flag is null
            ? ProblemCatalog.ToResult(new CompositionException(ProblemTypes.NotFound, "", $"There is no flag with id '{id}'."))
            : TypedResults.Ok(PartwiseMetrics.Reviewed(FlagItem.From(flag)));
    }

    /// <summary>Reads and checks the query; problems point at <c>/{parameter}</c>.</summary>
    /// <exception cref="CompositionException">400 for a bad parameter.</exception>
    public static (FlagQuery Query, int WaitSeconds) ReadQuery(string? baseline, string? status, string? after, string? limit, string? waitSeconds)
    {
        var filter = FlagStatusFilter.Open;
        if (status is not null && !FlagStatusNames.TryParseFilter(status, out filter))
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/status", "The query parameter 'status' is open, confirmed, dismissed or any.");
        }

        FlagCursor? cursor = null;
        if (after is not null)
        {
            cursor = FlagCursor.TryParse(after, out var parsed)
                ? parsed
                : throw new CompositionException(ProblemTypes.InvalidInput, "/after", "The query parameter 'after' is not a cursor this service made; pass the 'next' of an earlier page unchanged.");
        }

        var size = Integer(limit, "limit", 1, FlagQuery.MaxLimit) ?? FlagQuery.DefaultLimit;
        var wait = Integer(waitSeconds, "waitSeconds", 0, MaxWaitSeconds) ?? 0;
        if (baseline is { Length: 0 })
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/baseline", "The query parameter 'baseline' is a baseline id; leave it out for all baselines.");
        }

        return (new FlagQuery(baseline, filter, cursor, size), wait);
    }

    /// <summary>
    /// The ETag of a page: the store's change token (which moves with every flag raised or reviewed) and a hash of
    /// the query, so that two different listings never share an ETag.
    /// </summary>
    public static string ETagOf(ChangeToken token, FlagQuery query)
    {
        ArgumentNullException.ThrowIfNull(query);
        var text = string.Create(CultureInfo.InvariantCulture, $"{query.BaselineId}\n{query.Status}\n{query.After?.ToString()}\n{query.Limit}");
        var hash = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text)))[..16];
        return $"\"{token}.{hash}\"";
    }

    private static bool Matches(HttpRequest request, string etag)
    {
        if (!EntityTagHeaderValue.TryParseList(request.Headers.IfNoneMatch, out var tags))
        {
            return false;
        }

        var ours = new EntityTagHeaderValue(etag);
        // If-None-Match uses the weak comparison (RFC 9110 §13.1.2).
        return tags.Any(t => t.Equals(EntityTagHeaderValue.Any) || t.Compare(ours, useStrongComparison: false));
    }

    private static int? Integer(string? text, string name, int min, int max)
    {
        if (text is null)
        {
            return null;
        }

        return int.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var value) && value >= min && value <= max
            ? value
            : throw new CompositionException(ProblemTypes.InvalidInput, "/" + name, string.Create(CultureInfo.InvariantCulture, $"The query parameter '{name}' is an integer from {min} to {max}; larger values are refused, not clamped."));
    }
}
