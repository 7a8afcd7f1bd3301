using Microsoft.AspNetCore.Http.HttpResults;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Api.Shapes;
using Partwise.Core.Analysis;
using Partwise.Core.Problems;
using Partwise.Core.Zeros;
using Serilog;

namespace Partwise.Api.Analysis;

/// <summary>Log-ratio analysis (LRA) and its biplot.</summary>
public static class AnalysisEndpoints
{
    /// <summary>Maps <c>/v1/lra</c>.</summary>
    public static RouteGroupBuilder MapAnalysis(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("/v1").WithTags("Analysis").ProducesTableProblems().RequireAnyKey().WithComputeLimits();

        group.MapPost("/lra", Analyse)
            .WithName("AnalyseLogRatios")
            .WithSummary("Log-ratio analysis: the weighted PCA of the centred log-ratios, and its biplot")
            .WithDescription(
                "Applies the zero policy, then Z = D_r^(1/2) Yc D_w^(1/2) with Yc the weighted clr (clr_j = ln x_j − Σ_k w_k ln x_k) " +
                "centred with row weights 1/n, and its SVD Z = U S V' (Greenacre & Lewi 2009, J. Classification 26:29-54). " +
                "`singularValues`: all min(J − 1, n − 1); `inertia`: s_k² / TV, the fraction of the total variance per dimension; " +
                "`rows.principal`: D_r^(−1/2) U S; `parts.standard`: D_w^(−1/2) V; `parts.contributions`: V². Each dimension is " +
                "oriented so that its part with the largest |V_jk| is positive. `weights`: `equal` (default) or `mean` (mean " +
                "closed proportions). `dimensions`: 1 ≤ d ≤ min(J − 1, n − 1), default 2; otherwise 422 " +
                "`/problems/invalid-option` at `/dimensions`. Data without log-ratio variance: 422 `/problems/no-variation`.\n\n" +
                "`Accept: image/svg+xml` answers with the biplot of dimensions 1 and 2 (computed whatever `dimensions` says, " +
                "so it needs J ≥ 3 and n ≥ 3): samples as points at their principal coordinates, parts as labelled arrows from " +
                "the origin in the directions of their standard coordinates, drawn at their contribution coordinates √w_j × standard " +
                "(so that rare parts do not swamp the picture) times one factor that fits them to the samples (the factor is in " +
                "the picture's description), axis titles with each dimension's inertia in percent. The table comes as JSON " +
                "or text/csv (options as query parameters); tables over the part or row limits are 413 `/problems/too-large`.")
            .AcceptsTable<LraRequest>(
                Examples.Json("\"weights\": \"mean\", \"dimensions\": 2"),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv,
                [
                    .. CsvQuery.ZeroPolicy,
                    new CsvQueryParameter("weights", "`equal` (default) or `mean` part weights (JSON `weights`).", ["equal", "mean"]),
                    new CsvQueryParameter("dimensions", "How many dimensions of coordinates (JSON `dimensions`); default 2.", IsNumber: true),
                ]));

        return group;
    }

    /// <summary>Applies the zero policy and runs the analysis.</summary>
    /// <param name="request">The table, zero policy, weights and dimensions.</param>
    /// <param name="http">The request, whose <c>Accept</c> says whether the biplot's two dimensions are needed.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<PictureOk<LraResponse>, ProblemHttpResult> Analyse(LraRequest request, HttpRequest http, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(http);
        try
        {
            var table = request.ToTable();
            log.DescribeTable(table);
            var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
            var available = Math.Min(table.PartCount - 1, table.RowCount - 1);
            var dimensions = request.Dimensions ?? Math.Clamp(available, 1, 2);
            if (PictureNegotiation.PrefersSvg(http))
            {
                if (available < 2)
                {
                    throw new CompositionException(ProblemTypes.InvalidOption, "/dimensions", "The biplot shows dimensions 1 and 2, which need at least three parts and three rows.");
                }

                // Only a valid request is lifted to the two dimensions the picture needs; others get their own 422.
                dimensions = dimensions >= 1 && dimensions <= available ? Math.Max(dimensions, 2) : dimensions;
            }

            var result = LogRatioAnalysis.Run(zeros.Table, WeightsOption.ToSpec(request.Weights), dimensions, cancellationToken);
            return PictureResults.Ok(new LraResponse(
                result.SingularValues,
                result.Inertia,
                result.TotalVariance,
                result.Divisor,
                new LraRows(result.Ids, result.RowPrincipal),
                new LraParts(result.Parts, result.PartStandard, result.Contributions),
                result.Weights,
                ImputedCellItem.From(zeros.Imputed)));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }
}
