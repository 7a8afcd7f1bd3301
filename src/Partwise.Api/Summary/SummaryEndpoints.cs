using System.Globalization;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Variance;
using Partwise.Core.Zeros;
using Serilog;

namespace Partwise.Api.Summary;

/// <summary>Variance summaries and distances of a table.</summary>
public static class SummaryEndpoints
{
    private const string TableDescription =
        " The table comes as JSON (`parts`, `rows`, optional `ids` beside the options) or as text/csv (a header of " +
        "part names, an optional first column `id`; options as query parameters). Tables over the part or row " +
        "limits, or a body over the byte limit, are refused with 413 `/problems/too-large`. Unknown JSON members " +
        "are ignored.";

    /// <summary>Maps <c>/v1/summary</c> and <c>/v1/distances</c>.</summary>
    public static RouteGroupBuilder MapSummary(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("/v1").WithTags("Summary").ProducesTableProblems().RequireAnyKey().WithComputeLimits();

        group.MapPost("/summary", Summarise)
            .WithName("SummariseTable")
            .WithSummary("Centre and log-ratio variance of a table")
            .WithDescription(
                "Applies the zero policy, then computes the closed geometric mean (`center`), the variation matrix " +
                "T_ab = var(ln(x_a / x_b)), the total variance TV = Σ_{a<b} w_a w_b T_ab = Σ_j w_j var(clr_j) and each " +
                "part's share of it, and the covariance of the weighted clr. Every variance uses the divisor n − 1 " +
                "(`divisor`), so at least two rows are needed. The answer is JSON whatever `Accept` says: it holds " +
                "several tables." + TableDescription)
            .AcceptsTable<SummaryRequest>(
                Examples.Json("\"weights\": \"mean\""),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv,
                [
                    .. CsvQuery.ZeroPolicy,
                    new CsvQueryParameter("weights", "`equal` (default) or `mean` part weights (JSON `weights`); a weight per part is given as `weight.Ca=2`.", ["equal", "mean"]),
                ]));

        group.MapPost("/distances", Distances)
            .WithName("ComputeDistances")
            .WithSummary("Aitchison distances between samples")
            .WithDescription(
                "Applies the zero policy, then the Aitchison distance ‖clr(x_a) − clr(x_b)‖ between every two rows " +
                "(n × n, symmetric, zero diagonal). More than `Partwise:Limits:MaxDistanceRows` rows (default 5,000) is a " +
                "422 `/problems/computation-limit`. As text/csv the columns are labelled by the ids (or row numbers)." + TableDescription)
            .AcceptsTable<DistancesRequest>(
                Examples.Json(),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv, CsvQuery.ZeroPolicy));

        return group;
    }

    /// <summary>Applies the zero policy and summarises the table.</summary>
    /// <param name="request">The table, zero policy and weights.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<Ok<SummaryResponse>, ProblemHttpResult> Summarise(SummaryRequest request, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        try
        {
            var table = request.ToTable();
            log.DescribeTable(table);
            var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
            var weights = PartWeights.Resolve(WeightsOption.ToSpec(request.Weights), zeros.Table);
            var summary = CompositionSummary.Compute(zeros.Table, weights, cancellationToken);
            var j = table.PartCount;
            return TypedResults.Ok(new SummaryResponse(
                table.Parts,
                summary.Center,
                new RowMajor(summary.VariationMatrix, j),
                summary.TotalVariance,
                summary.PartContributions,
                new RowMajor(summary.ClrCovariance, j),
                summary.Weights,
                summary.Divisor,
                ImputedCellItem.From(zeros.Imputed)));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    /// <summary>Applies the zero policy and computes the distance matrix.</summary>
    /// <param name="request">The table and zero policy.</param>
    /// <param name="limits">The computation limits.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<TableOk<DistancesResponse>, ProblemHttpResult> Distances(DistancesRequest request, IOptions<LimitsOptions> limits, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(limits);
        try
        {
            var table = request.ToTable();
            log.DescribeTable(table);
            var max = limits.Value.MaxDistanceRows;
            if (table.RowCount > max)
            {
                throw new CompositionException(
                    ProblemTypes.ComputationLimit,
                    "/rows",
                    string.Create(CultureInfo.InvariantCulture, $"The table has {table.RowCount} rows; distances are computed for at most {max} (an n × n result)."));
            }

            var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
            var matrix = AitchisonDistance.Matrix(zeros.Table, cancellationToken);
            return TableResults.Ok(new DistancesResponse(table.Ids, new RowMajor(matrix, table.RowCount), ImputedCellItem.From(zeros.Imputed)));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }
}
