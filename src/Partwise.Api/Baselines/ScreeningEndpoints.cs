using System.Globalization;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Core.Problems;
using Partwise.Storage;
using Partwise.Storage.Screenings;
using Serilog;

namespace Partwise.Api.Baselines;

/// <summary>Screening samples against a stored baseline (recorded, idempotent) or an inline baseline document (nothing stored).</summary>
public static class ScreeningEndpoints
{
    private const string SampleRules =
        " Each sample S = `{id, values: {part: value}, observedAt, source}`; parts are matched by name, and a missing " +
        "or unknown part is a 422 (`/problems/missing-part`, `/problems/unknown-part`) at `/samples/i/values/{part}` " +
        "(`/sample/values/{part}` for one sample). Values are finite and non-negative (negative: 422 " +
        "`/problems/negative-value`; NaN is not JSON: 400); zeros get the baseline's zero policy, applied to each " +
        "sample on its own (multiplicative replacement uses the sample's own sum), and a zero under `reject` is a 422 " +
        "`/problems/zero-value`. More than `Partwise:Limits:MaxScreeningSamples` samples (default 1,000) is a 413 " +
        "`/problems/too-large`. Each result has the Mahalanobis `distance` d and `squaredDistance` d², the `pValue` " +
        "1 − F_χ²(d²; p), `flagged` (d² above the threshold, or a rule violated), the three `reasons` with the " +
        "largest |z| among the pairwise and named amalgamation ratios (whatever the coordinates, so an analyst reads " +
        "why a sample stands out), with the central 95% `expected` range in ratio units, and `ruleViolations`.";

    /// <summary>Maps <c>POST /v1/baselines/{id}/screenings</c> and <c>POST /v1/screenings</c>.</summary>
    public static IEndpointRouteBuilder MapScreenings(this IEndpointRouteBuilder app)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.MapGroup("/v1/baselines").WithTags("Screening")
            .MapPost("/{id}/screenings", ScreenStored)
            .RequireRole(Roles.Submitter)
            .WithScreeningLimits()
            .WithName("ScreenSamples")
            .WithSummary("Screen samples against a stored baseline")
            .WithDescription(
                "Screens one sample (`sample`) or a batch (`samples`) and records every result, committed durably " +
                "before the response is sent; a flagged sample raises a flag (see `GET /v1/flags`, `flagId`). " +
                "Idempotent on (baseline, sample id): the same sample posted again returns the stored result with " +
                "`duplicate: true`; the same id with other values is a 409 `/problems/conflict` pointing at the " +
                "sample's id, and then nothing of the request is stored. An unknown baseline is a 404 " +
                "`/problems/not-found`, a retired one a 410 `/problems/baseline-retired`; storage that cannot be " +
                "reached a 503 `/problems/storage-unavailable` (nothing stored; retry)." + SampleRules + BaselineEndpoints.Caution)
            .WithMetadata(new JsonRequestMetadata(typeof(ScreeningRequest), BaselineExamples.Screening))
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status404NotFound)
            .ProducesProblem(StatusCodes.Status409Conflict)
            .ProducesProblem(StatusCodes.Status410Gone)
            .ProducesProblem(StatusCodes.Status413PayloadTooLarge)
            .ProducesProblem(StatusCodes.Status415UnsupportedMediaType)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity)
            .ProducesProblem(StatusCodes.Status503ServiceUnavailable);

        app.MapGroup("/v1").WithTags("Screening")
            .MapPost("/screenings", ScreenInline)
            .RequireAnyKey()
            .WithScreeningLimits()
            .WithName("ScreenSamplesInline")
            .WithSummary("Screen samples against a baseline document sent with them")
            .WithDescription(
                "Screens the samples against `baseline`, a document exactly as `GET /v1/baselines/{id}` returns it " +
                "(its `id` and `retiredAt` are not used), with nothing stored: the results are those the stored " +
                "screening gives, with `flagId` null and `duplicate` false. Every field of the document is checked, with " +
                "pointers under `/baseline` (a missing field 400, one that cannot be used 422)." + SampleRules + BaselineEndpoints.Caution)
            .WithMetadata(new JsonRequestMetadata(typeof(InlineScreeningRequest), InlineExample.Value))
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status413PayloadTooLarge)
            .ProducesProblem(StatusCodes.Status415UnsupportedMediaType)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity);
        return app;
    }

    /// <summary>Screens the samples against the stored baseline and records the results.</summary>
    /// <param name="id">The baseline's id.</param>
    /// <param name="request">One sample or a batch.</param>
    /// <param name="store">The store.</param>
    /// <param name="cache">Rebuilt baselines.</param>
    /// <param name="limits">The batch limit.</param>
    /// <param name="log">The request's completion event.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<Ok<ScreeningResponse>, ProblemHttpResult>> ScreenStored(
        string id,
        ScreeningRequest request,
        StoreAccess store,
        BaselineCache cache,
        IOptions<LimitsOptions> limits,
        IDiagnosticContext log,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(cache);
        ArgumentNullException.ThrowIfNull(limits);
        PlacedSample[] samples;
        try
        {
            samples = SampleScreening.Place(request.Sample, request.Samples, limits.Value.MaxScreeningSamples);
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }

        log.Set("BaselineId", id);
        log.Set("SampleCount", samples.Length);
        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        var baseline = cache.Find(id);
        if (baseline is null)
        {
            var record = await storage.Baselines.GetAsync(id, cancellationToken).ConfigureAwait(false);
            if (record is null)
            {
                return BaselineEndpoints.NotFound(id);
            }

            if (record.IsRetired)
            {
                return Retired(id);
            }

            baseline = cache.Add(record);
        }

        ScreeningResultItem[] results;
        try
        {
            results = SampleScreening.Screen(baseline, samples);
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }

        var entries = new ScreeningEntry[samples.Length];
        for (var i = 0; i < samples.Length; i++)
        {
            var (item, result) = (samples[i].Item, results[i]);
            entries[i] = new ScreeningEntry(
                item.Id!,
                SampleFingerprint.Compute(item.Values!),
                BaselineJson.Write(result),
                item.ObservedAt,
                item.Source,
                result.Flagged ? new ScreeningFlag(result.Distance, result.PValue, BaselineJson.Write(result.Reasons), BaselineJson.Write(item.Values!)) : null);
        }

        var batch = await storage.Screenings.RecordBatchAsync(id, entries, cancellationToken).ConfigureAwait(false);
        switch (batch.Status)
        {
            case ScreeningBatchStatus.BaselineNotFound:
                return BaselineEndpoints.NotFound(id);
            case ScreeningBatchStatus.BaselineRetired:
                return Retired(id);
            case ScreeningBatchStatus.Conflict:
                var conflicts = batch.Outcomes
                    .Select((o, i) => (o, i))
                    .Where(x => x.o.Kind == ScreeningOutcomeKind.Conflict)
                    .Select(x => new ProblemError(samples[x.i].Pointer + "/id", $"The sample '{x.o.SampleId}' was screened against this baseline before with other values."))
                    .ToArray();
                return ProblemCatalog.ToResult(new CompositionException(
                    ProblemTypes.Conflict,
                    string.Create(CultureInfo.InvariantCulture, $"{conflicts.Length} sample id(s) were screened before with other values; nothing of this request was stored. Send each sample under a new id."),
                    conflicts));
        }

        var items = new ScreeningResultItem[samples.Length];
        var flagged = 0;
        for (var i = 0; i < items.Length; i++)
        {
            var outcome = batch.Outcomes[i];
            var stored = outcome.Stored ?? throw new InvalidOperationException("A committed screening has no stored record.");
            // A sample recorded now answers with the result just computed (what was stored is its JSON, which reads
            // back the same: doubles are written round-trip); a duplicate answers with what was stored first.
            var result = outcome.Kind == ScreeningOutcomeKind.Recorded ? results[i] : BaselineJson.Read<ScreeningResultItem>(stored.ResultJson);
            items[i] = result with
            {
                FlagId = stored.FlagId,
                Duplicate = outcome.Kind == ScreeningOutcomeKind.Duplicate,
            };
            flagged += items[i].Flagged ? 1 : 0;
        }

        log.Set("FlaggedCount", flagged);
        return TypedResults.Ok(new ScreeningResponse(PartwiseMetrics.Screened(id, items)));
    }

    /// <summary>Screens the samples against the baseline document in the request; nothing is stored.</summary>
    /// <param name="request">The baseline document and the samples.</param>
    /// <param name="limits">The batch limit.</param>
    /// <param name="log">The request's completion event.</param>
    public static Results<Ok<ScreeningResponse>, ProblemHttpResult> ScreenInline(InlineScreeningRequest request, IOptions<LimitsOptions> limits, IDiagnosticContext log)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(limits);
        ArgumentNullException.ThrowIfNull(log);
        try
        {
            var baseline = BaselineReading.Rebuild(request.Baseline, "/baseline");
            var samples = SampleScreening.Place(request.Sample, request.Samples, limits.Value.MaxScreeningSamples);
            log.Set("PartCount", baseline.Baseline.PartCount);
            log.Set("SampleCount", samples.Length);
            return TypedResults.Ok(new ScreeningResponse(PartwiseMetrics.ScreenedInline(SampleScreening.Screen(baseline, samples))));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    private static ProblemHttpResult Retired(string id) =>
        ProblemCatalog.ToResult(new CompositionException(ProblemTypes.BaselineRetired, "", $"The baseline '{id}' is retired and takes no more screenings; its document, screenings and flags can still be read."));

    /// <summary>The inline example: the example baseline fitted here (deterministic) and one sample.</summary>
    private static class InlineExample
    {
        public static readonly string Value = Build();

        private static string Build()
        {
            var request = RequestJson.Deserialize<BaselineRequest>(System.Text.Encoding.UTF8.GetBytes(BaselineExamples.Baseline));
            var document = BaselineFitting.Fit(request).Stamp("b-example", 1, new DateTimeOffset(2026, 5, 1, 8, 0, 0, TimeSpan.Zero));
            return "{\"baseline\": " + BaselineJson.Write(document) + ", \"samples\": [" + BaselineExamples.Sample + "]}";
        }
    }
}
