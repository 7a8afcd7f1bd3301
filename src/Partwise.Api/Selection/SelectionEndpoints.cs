using System.Globalization;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using Partwise.Api.Coordinates;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Transforms;
using Partwise.Core.Variance;
using Partwise.Core.Zeros;
using Serilog;

namespace Partwise.Api.Selection;

/// <summary>Choosing log-ratios that explain a table's variance, judging an analyst's own set, and inverting a complete set.</summary>
public static class SelectionEndpoints
{
    private const string TableDescription =
        " The table comes as JSON (`parts`, `rows`, optional `ids` beside the options) or as text/csv (a header of " +
        "part names, an optional first column `id`; simple options as query parameters, lists and objects need JSON). " +
        "Tables over the part or row limits, or a body over the byte limit, are refused with 413 `/problems/too-large`. " +
        "Unknown JSON members are ignored; numbers must be JSON numbers (no NaN or Infinity).";

    private const string SelectionExample =
        "\"amalgamations\": {\"hardness\": [\"Ca\", \"Mg\"], \"alkalis\": [\"Na\", \"K\"]}, \"stop\": {\"maxRatios\": 4, \"explained\": 0.99}";

    private const string EvaluationExample =
        "\"ratios\": [{\"num\": [\"Na\"], \"den\": [\"Cl\"]}, {\"num\": [\"Ca\", \"Mg\"], \"den\": [\"Na\", \"K\"], \"kind\": \"amalgamation\"}, " +
        "{\"num\": [\"HCO3\"], \"den\": [\"SO4\", \"NO3\"], \"kind\": \"balance\"}]";

    /// <summary>Maps <c>/v1/ratio-selection</c>, <c>/v1/ratio-sets/evaluate</c> and <c>/v1/ratio-sets/reconstruct</c>.</summary>
    public static RouteGroupBuilder MapSelection(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("/v1").WithTags("Ratio selection").ProducesTableProblems().RequireAnyKey().WithComputeLimits();

        group.MapPost("/ratio-selection", Select)
            .WithName("SelectRatios")
            .WithSummary("Choose, step by step, the log-ratios that explain the most variance")
            .WithDescription(
                "Greedy forward selection (Greenacre 2019, Math. Geosci. 51:649-682): each step adds the candidate log-ratio " +
                "that raises the explained fraction of the total log-ratio variance TV = Σ_j w_j var(clr_j) the most, where " +
                "explained = 1 − Σ_j w_j RSS_j / (n TV) from regressing every weighted clr column on the chosen ratios. " +
                "Candidates: every pairwise ratio of usable parts, and ratios of each named amalgamation (`amalgamations`, name → " +
                "two or more parts) to a part or another amalgamation with no part in common. Ties within 1e-9 go to the first " +
                "candidate in table order (parts, then amalgamations as given; the lower column is the numerator), so the path " +
                "is reproducible. `force` ratios come first in the order given (a side may name one amalgamation); `exclude` " +
                "keeps parts out of every candidate, and the variance to explain still covers all parts. `stop.maxRatios` " +
                "(default: usable parts − 1) and `stop.explained` (in (0, 1], default 1; the step that first reaches it is " +
                "included). Each step reports the cumulative `explained`, its `gain`, and the Procrustes correlation between " +
                "the samples in all log-ratios and in the ratios so far (Gower 1975). `graph` has a node per part or " +
                "amalgamation used and an edge per ratio from numerator to denominator; `invertible` says whether the ratios " +
                "determine the composition.\n\n" +
                "In place of the table, `moments` {`names`, `covariance`, `count`} carry the sample covariance (divisor n − 1) " +
                "of the logs of the parts and then of the named amalgamations' sums, in the order of `names` (the parts, then " +
                "the amalgamations in their order), as a distributed engine computes it: the path is the table's. With moments, " +
                "`weights` are `equal` or a weight per part (`mean` needs the table: 422 `/problems/invalid-weights`) and zeros " +
                "must have been handled before the logs were taken. Exactly one of a table or `moments`, else 400.\n\n" +
                "Problems: an unknown part (422 `/problems/unknown-part`), an amalgamation of one part, a repeated part or a " +
                "name that is a part (400 at `/amalgamations/name`), overlapping sides or a missing kind (422 " +
                "`/problems/invalid-ratio` at `/force/i`), a forced ratio that repeats or depends on those before it (422 " +
                "`/problems/dependent-ratio` at `/force/i`), exclusions leaving fewer than two parts (422 at `/exclude`), " +
                "`stop` out of range (422 `/problems/invalid-option` at `/stop/explained` or `/stop/maxRatios`), moments whose " +
                "names do not match or whose covariance is not square, symmetric and positive semi-definite (422 " +
                "`/problems/invalid-moments` at `/moments/names/i`, `/moments/covariance` or `/moments/count`), and data " +
                "without log-ratio variance (422 `/problems/no-variation`).\n\n" +
                "`Accept: image/svg+xml` answers with a picture instead: the graph of the chosen ratios (nodes on a circle, " +
                "arrows from numerator to denominator labelled with the step) beside the curve of the cumulative explained " +
                "fraction by step." + TableDescription)
            .AcceptsTable<RatioSelectionRequest>(
                Examples.Json(SelectionExample),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv,
                [
                    .. CsvQuery.ZeroPolicy,
                    Weights,
                    new CsvQueryParameter("maxRatios", "The most ratios (JSON `stop.maxRatios`); default the number of usable parts minus one.", IsNumber: true),
                    new CsvQueryParameter("explained", "Stop when the cumulative explained fraction reaches this, in (0, 1] (JSON `stop.explained`); default 1.", IsNumber: true),
                ]));

        group.MapPost("/ratio-sets/evaluate", Evaluate)
            .WithName("EvaluateRatioSet")
            .WithSummary("How much of a table's variance an analyst's ratio set explains")
            .WithDescription(
                "Applies the zero policy, then regresses every weighted clr column on the set's ratios (Greenacre 2019): " +
                "`explained` = 1 − Σ_j w_j RSS_j / (n TV) for the whole set; per ratio `explainedAlone` (that ratio by itself) " +
                "and `uniqueContribution` (the set's fraction less that of the set without it). `procrustes` is the Procrustes " +
                "correlation between the samples in all log-ratios and in the set (Gower 1975), `rank` the dimension the " +
                "ratios span on these data, and `invertible` whether the set determines the composition. Ratios may be " +
                "pairwise, amalgamation or balance ratios. With text/csv, pairwise ratios come as repeated query parameters " +
                "`ratio=Na/Cl`; other ratios need JSON. Problems: no ratios (400 at `/ratios`), an unknown part (422 " +
                "`/problems/unknown-part` at `/ratios/i/num/k`), overlapping sides or a missing kind (422 " +
                "`/problems/invalid-ratio` at `/ratios/i`), data without log-ratio variance (422 `/problems/no-variation`)." + TableDescription)
            .AcceptsTable<RatioSetEvaluationRequest>(
                Examples.Json(EvaluationExample),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv,
                [.. CsvQuery.ZeroPolicy, Weights, RatioQuery]));

        group.MapPost("/ratio-sets/reconstruct", Reconstruct)
            .WithName("ReconstructFromRatios")
            .WithSummary("Compositions back from the values of a complete ratio set")
            .WithDescription(
                "Each pairwise or amalgamation ratio with log value y is one equation Σ_num x − e^y Σ_den x = 0; with Σ x = " +
                "`total` (default 1) that is J equations for J − 1 ratios, solved per row (Greenacre 2020, Applied Computing and " +
                "Geosciences 5:100017). Sets of pairwise ratios and balances are solved in ln x instead. `rows` hold the J − 1 " +
                "values (natural logs) of each composition in the order of `ratios`. The answer is the closed table, or " +
                "text/csv when `Accept` asks for it. Refused with 422 `/problems/singular-ratio-set` at `/ratios`: a set that " +
                "is not J − 1 ratios, is incomplete (pairwise ratios not joining every part: not a spanning tree), or is " +
                "singular or ill-conditioned (also at `/rows/i` when only that row's values make it so); 422 " +
                "`/problems/infeasible-ratio-values` at `/rows/i` when the values give a part ≤ 0; 422 " +
                "`/problems/unsupported-ratio-set` for balances mixed with amalgamations. `/v1/coordinates/inverse` with " +
                "transform `ratios` runs the same computation. As text/csv: one row of values per composition under any header " +
                "(optional first column `id`), `parts` as a comma-separated query parameter and the pairwise ratios as " +
                "repeated `ratio=Ca/Cl`. Over the part or row limits is 413 `/problems/too-large`.")
            .AcceptsTable<RatioReconstructionRequest>(
                "{\"parts\": [\"Ca\", \"Mg\", \"Na\", \"Cl\"], \"ratios\": [{\"num\": [\"Ca\"], \"den\": [\"Cl\"]}, {\"num\": [\"Mg\"], \"den\": [\"Cl\"]}, " +
                "{\"num\": [\"Na\"], \"den\": [\"Cl\"]}], \"rows\": [[0.5770, -0.7890, -0.3667]], \"ids\": [\"well-07/2026-03-02\"], \"total\": 100}",
                new CsvRequestMetadata(
                    "Ratio values: a header (labels; only their number matters, optional first column `id`), then one row per composition.",
                    "id,Ca/Cl,Mg/Cl,Na/Cl\nwell-07/2026-03-02,0.5770,-0.7890,-0.3667\n",
                    [
                        new CsvQueryParameter("parts", "The part names of the output, comma-separated (JSON `parts`)."),
                        RatioQuery,
                        new CsvQueryParameter("total", "The closure total κ > 0 (JSON `total`); default 1.", IsNumber: true),
                    ]));

        return group;
    }

    private static CsvQueryParameter Weights { get; } =
        new("weights", "`equal` (default) or `mean` part weights (JSON `weights`); a weight per part is given as `weight.Ca=2`.", ["equal", "mean"]);

    private static CsvQueryParameter RatioQuery { get; } =
        new("ratio", "A pairwise ratio `num/den` such as `Na/Cl`, repeated once per ratio in order (JSON `ratios`); amalgamations and balances need JSON.");

    /// <summary>Runs the stepwise selection on a table or on its moments.</summary>
    /// <param name="request">The table or moments and the options.</param>
    /// <param name="limits">The size limits, for the moments' names.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<PictureOk<RatioSelectionResponse>, ProblemHttpResult> Select(RatioSelectionRequest request, IOptions<LimitsOptions> limits, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(limits);
        try
        {
            var hasTable = request.Csv is not null || request.Parts is not null || request.Rows is not null;
            if (hasTable == (request.Moments is not null))
            {
                throw new CompositionException(
                    ProblemTypes.InvalidInput,
                    hasTable ? "/moments" : "",
                    hasTable
                        ? "Send either a table (\"parts\" and \"rows\") or \"moments\", not both."
                        : "The request needs a table (\"parts\" and \"rows\") or \"moments\" {\"names\", \"covariance\", \"count\"}.");
            }

            var amalgamations = (request.Amalgamations ?? []).Select(a => new NamedAmalgamation(a.Key, a.Value ?? [])).ToArray();
            var options = new RatioSelectionOptions
            {
                Amalgamations = amalgamations,
                Force = [.. (request.Force ?? []).Select((r, i) => ForceTerms(r, i))],
                Exclude = request.Exclude ?? [],
                MaxRatios = request.Stop?.MaxRatios,
                Explained = request.Stop?.Explained,
            };
            var spec = WeightsOption.ToSpec(request.Weights);
            RatioSelectionResult result;
            ImputedCellItem[] imputed;
            if (request.Moments is { } moments)
            {
                var names = moments.Names ?? throw TableRequest.Missing("/moments/names", "The moments need \"names\": the parts, then the amalgamations.");
                var covariance = moments.Covariance ?? throw TableRequest.Missing("/moments/covariance", "The moments need \"covariance\": one row per name.");
                var count = moments.Count ?? throw TableRequest.Missing("/moments/count", "The moments need \"count\": the number of samples.");
                TableRequest.CheckLimits(names.Count, 0, limits.Value);
                log.Set("PartCount", names.Count - amalgamations.Length);
                log.Set("RowCount", count);
                var weights = MomentWeights(spec, names, amalgamations.Length);
                result = PartwiseMetrics.TimeSelection("ratio-selection", () => RatioSelection.Run(new SelectionMoments(names, covariance, count), weights, options, cancellationToken));
                imputed = [];
            }
            else
            {
                var table = request.ToTable();
                log.DescribeTable(table);
                var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
                var weights = PartWeights.Resolve(spec, zeros.Table);
                result = PartwiseMetrics.TimeSelection("ratio-selection", () => RatioSelection.Run(zeros.Table, weights, options, cancellationToken));
                imputed = ImputedCellItem.From(zeros.Imputed);
            }

            log.Set("RatioCount", result.Steps.Count);
            return PictureResults.Ok(new RatioSelectionResponse(
                result.TotalVariance,
                result.Divisor,
                [.. result.Steps.Select(s => new SelectionStepItem(RatioOption.From(s.Ratio, result.Parts), s.Label, s.Explained, s.Gain, s.Procrustes, s.Forced))],
                new RatioGraphItem(result.Graph.Nodes, [.. result.Graph.Edges.Select(e => new RatioEdgeItem(e.From, e.To, e.Label))], result.Graph.Acyclic, result.Graph.Connected),
                result.Invertible,
                imputed));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    /// <summary>Evaluates an analyst's ratio set on a table.</summary>
    /// <param name="request">The table, zero policy, ratios and weights.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<Ok<RatioSetEvaluationResponse>, ProblemHttpResult> Evaluate(RatioSetEvaluationRequest request, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        try
        {
            var table = request.ToTable();
            log.DescribeTable(table);
            var ratios = RatioOption.ToLogRatios(request.Ratios, table.Parts, "/ratios");
            log.Set("RatioCount", ratios.Length);
            var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
            var weights = PartWeights.Resolve(WeightsOption.ToSpec(request.Weights), zeros.Table);
            var result = RatioSetEvaluation.Evaluate(zeros.Table, ratios, weights, cancellationToken);
            return TypedResults.Ok(new RatioSetEvaluationResponse(
                result.Explained,
                result.Procrustes,
                result.Rank,
                result.Invertible,
                result.TotalVariance,
                result.Divisor,
                [.. result.PerRatio.Select(p => new RatioContributionItem(p.Label, p.ExplainedAlone, p.UniqueContribution))],
                ImputedCellItem.From(zeros.Imputed)));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    /// <summary>Turns the values of a complete ratio set back into closed compositions.</summary>
    /// <param name="request">The parts, ratios, values and total.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<TableOk<TableResponse>, ProblemHttpResult> Reconstruct(RatioReconstructionRequest request, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        try
        {
            var names = request.Parts ?? throw TableRequest.Missing("/parts", "The request needs \"parts\": the part names of the compositions.");
            var parts = PartNames.Require(names);
            var width = request.Ratios?.Count ?? 0;
            double[] values;
            IReadOnlyList<string>? ids;
            if (request.Csv is { } csv)
            {
                if (request.Ratios is not null && csv.Columns.Count != width)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, "/rows", string.Create(CultureInfo.InvariantCulture, $"The CSV has {csv.Columns.Count} value columns for {width} ratios."));
                }

                (values, ids) = (csv.Values, csv.Ids);
            }
            else
            {
                var rows = request.Rows ?? throw TableRequest.Missing("/rows", "The request needs \"rows\": one array of ratio values per composition.");
                if (request.Ratios is null)
                {
                    throw TableRequest.Missing("/ratios", "The request needs \"ratios\": the J − 1 ratios the values belong to.");
                }

                (values, ids) = (CoordinateInput.Flatten(rows, width), request.Ids);
            }

            log.Set("PartCount", parts.PartCount);
            log.Set("RowCount", width == 0 ? 0 : values.Length / width);
            var table = RatioSets.Reconstruct(parts, request.Ratios, values, width, request.Total ?? 1.0, ids, "/ratios", cancellationToken);
            return TableResults.Ok(TableResponse.From(table));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    private static RatioTerms ForceTerms(RatioOption? ratio, int i)
    {
        var pointer = string.Create(CultureInfo.InvariantCulture, $"/force/{i}");
        return (ratio ?? throw new CompositionException(ProblemTypes.InvalidInput, pointer, "A forced ratio must be an object, not null.")).ToTerms(pointer);
    }

    /// <summary>Weights for moments: equal, or given per part; mean proportions need the table itself.</summary>
    private static double[] MomentWeights(PartWeightSpec spec, IReadOnlyList<string> names, int amalgamationCount)
    {
        var j = names.Count - amalgamationCount;
        if (spec.Mode == "mean")
        {
            throw new CompositionException(ProblemTypes.InvalidWeights, "/weights", "Mean proportions need the table; with moments use \"equal\" or a weight per part.");
        }

        if (j < 2)
        {
            // Too few names: the selection refuses them with its own problem; any valid weights get it there.
            return j == 1 ? [1.0] : [];
        }

        var partNames = names.Take(j).ToArray();
        if (spec.Mode == "equal")
        {
            var w = new double[j];
            Array.Fill(w, 1.0 / j);
            return w;
        }

        CompositionTable ones;
        try
        {
            ones = PartNames.Require(partNames);
        }
        catch (CompositionException e)
        {
            throw new CompositionException(ProblemTypes.InvalidMoments, e.Message, [.. e.Errors.Select(r => r with { Pointer = r.Pointer.StartsWith("/parts", StringComparison.Ordinal) ? "/moments/names" + r.Pointer["/parts".Length..] : r.Pointer })]);
        }

        return PartWeights.Resolve(spec, ones);
    }
}
