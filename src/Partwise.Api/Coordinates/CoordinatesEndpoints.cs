using System.Globalization;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Tables;
using Partwise.Core.Transforms;
using Partwise.Core.Zeros;
using Serilog;

namespace Partwise.Api.Coordinates;

/// <summary>Closing tables and moving between compositions and log-ratio coordinates.</summary>
public static class CoordinatesEndpoints
{
    private const string TableDescription =
        " The table comes as JSON (`parts`, `rows`, optional `ids` beside the options) or as text/csv (a header of " +
        "part names, an optional first column `id`; options as query parameters). Tables over " +
        "`Partwise:Limits:MaxParts` parts (default 1,000) or `MaxRows` rows (default 1,000,000) are refused with " +
        "413 `/problems/too-large`, as is a body over `MaxBodyBytes` (default 32 MiB). Unknown JSON members are " +
        "ignored so that callers built against later versions keep working; member names are matched exactly " +
        "(camelCase), and numbers must be JSON numbers (no NaN or Infinity).";

    /// <summary>Maps <c>/v1/compositions/prepare</c>, <c>/v1/coordinates</c> and <c>/v1/coordinates/inverse</c>.</summary>
    public static RouteGroupBuilder MapCoordinates(this IEndpointRouteBuilder app)
    {
        var group = app.MapGroup("/v1").WithTags("Coordinates").ProducesTableProblems().RequireAnyKey().WithComputeLimits();

        group.MapPost("/compositions/prepare", Prepare)
            .WithName("PrepareCompositions")
            .WithSummary("Handle zeros and close a table")
            .WithDescription(
                "Applies the zero policy (default `reject`: any zero is a 422 `/problems/zero-value` pointing at its " +
                "cell `/rows/i/j`), then closes every row to `total` (default 1): C(x) = κ x / Σ x (Aitchison 1986). " +
                "`imputed` lists every replaced cell with its value in the closed table." + TableDescription)
            .AcceptsTable<PrepareRequest>(
                Examples.Json("\"total\": 100"),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv, [.. CsvQuery.ZeroPolicy, Total]));

        group.MapPost("/coordinates", Forward)
            .WithName("ComputeCoordinates")
            .WithSummary("Log-ratio coordinates of a table")
            .WithDescription(
                "Applies the zero policy, then the transform: `clr` ln x_j − Σ w_k ln x_k (optional part `weights`), " +
                "`alr` ln(x_j / x_D) (default D: the last part), `ilr` V' ln x with the pivot basis (Fišerová & Hron " +
                "2011) or the basis of a sequential binary `partition` (Egozcue & Pawlowsky-Glahn 2005; `basis` is " +
                "returned), `pairwise` all J(J − 1)/2 ln(x_a / x_b), or `ratios` an expert's list of pairwise, " +
                "amalgamation and balance log-ratios. A result over `Partwise:Limits:MaxResultValues` numbers is a 422 " +
                "`/problems/computation-limit`. Partitions and ratio lists need a JSON body." + TableDescription)
            .AcceptsTable<CoordinatesRequest>(
                Examples.Json("\"transform\": {\"type\": \"alr\", \"denominator\": \"Cl\"}"),
                new CsvRequestMetadata("The table: a header of part names (optional first column `id`), then one row per sample.", Examples.Csv, [.. CsvQuery.ZeroPolicy, .. TransformQuery]));

        group.MapPost("/coordinates/inverse", Inverse)
            .WithName("InvertCoordinates")
            .WithSummary("Compositions back from log-ratio coordinates")
            .WithDescription(
                "Inverts `clr` (C(exp y)), `alr` (C([exp y, 1]) with the 1 at the denominator) and `ilr` (C(exp(V z)), " +
                "with the same `partition` as the forward transform, or the pivot basis), and closes to `total` " +
                "(default 1). `rows` hold J coordinates for clr and J − 1 for alr and ilr; `parts` name the output. " +
                "A `ratios` set of exactly J − 1 pairwise and amalgamation ratios (or pairwise ratios and balances) is solved " +
                "for the composition as `/v1/ratio-sets/reconstruct` does (Greenacre 2020): a set that is incomplete (pairwise " +
                "ratios not joining every part), singular or ill-conditioned is 422 `/problems/singular-ratio-set` at " +
                "`/transform/ratios`, values giving a part ≤ 0 are 422 `/problems/infeasible-ratio-values` at `/rows/i`. " +
                "Pairwise coordinates are refused with 422 `/problems/invalid-option`. As text/csv: one row of " +
                "coordinates per sample under any header (optional first column `id`), with `parts` as a comma-separated " +
                "query parameter. Over the part or row limits is 413 `/problems/too-large`.")
            .AcceptsTable<InverseRequest>(
                "{\"parts\": [\"Ca\", \"Mg\", \"Na\", \"Cl\"], \"transform\": {\"type\": \"alr\", \"denominator\": \"Cl\"}, " +
                "\"rows\": [[0.5770, -0.7890, -0.3667]], \"ids\": [\"well-07/2026-03-02\"], \"total\": 100}",
                new CsvRequestMetadata(
                    "Coordinates: a header (labels; only their number matters, optional first column `id`), then one row per sample.",
                    "id,Ca/Cl,Mg/Cl,Na/Cl\nwell-07/2026-03-02,0.5770,-0.7890,-0.3667\n",
                    [new CsvQueryParameter("parts", "The part names of the output, comma-separated (JSON `parts`)."), .. TransformQuery, Total]));

        return group;
    }

    private static CsvQueryParameter Total { get; } = new("total", "The closure total κ > 0 (JSON `total`); default 1.", IsNumber: true);

    private static CsvQueryParameter[] TransformQuery { get; } =
    [
        new("transform", "The transform type (JSON `transform.type`); `ratios` needs a JSON body.", ["clr", "alr", "ilr", "pairwise"]),
        new("denominator", "For `alr`: the denominator part (JSON `transform.denominator`); default the last part."),
        new("weights", "For `clr`: `equal` (default) or `mean` part weights (JSON `transform.weights`); a weight per part is given as `weight.Ca=2`.", ["equal", "mean"]),
    ];

    /// <summary>Applies the zero policy and closes the table.</summary>
    /// <param name="request">The table, zero policy and total.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    public static Results<TableOk<PrepareResponse>, ProblemHttpResult> Prepare(PrepareRequest request, IDiagnosticContext log)
    {
        ArgumentNullException.ThrowIfNull(request);
        try
        {
            var table = request.ToTable();
            log.DescribeTable(table);
            var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
            var closed = Closure.Close(zeros.Table, request.Total ?? 1.0);

            // The replacement keeps each row's sum, so the closed value of an imputed cell is read off the closed table.
            var imputed = zeros.Imputed
                .Select(c => new ImputedCellItem(c.Row, c.Part, closed.Values[(c.Row * closed.PartCount) + c.PartIndex]))
                .ToArray();
            return TableResults.Ok(new PrepareResponse(closed.Parts, new RowMajor(closed.Values, closed.PartCount), closed.Ids, imputed));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    /// <summary>Applies the zero policy and the transform.</summary>
    /// <param name="request">The table, zero policy and transform.</param>
    /// <param name="limits">The computation limits.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<TableOk<CoordinatesResponse>, ProblemHttpResult> Forward(CoordinatesRequest request, IOptions<LimitsOptions> limits, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(limits);
        try
        {
            var table = request.ToTable();
            log.DescribeTable(table);
            log.Set("Transform", request.Transform?.Type);
            var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
            var (coordinates, basis) = Transforms.Forward(zeros.Table, request.Transform, limits.Value.MaxResultValues, cancellationToken);
            return TableResults.Ok(new CoordinatesResponse(
                coordinates.Columns,
                coordinates.Ids,
                new RowMajor(coordinates.Values, coordinates.ColumnCount),
                basis is null ? null : new RowMajor(basis.Coefficients, basis.Dimension),
                ImputedCellItem.From(zeros.Imputed)));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }

    /// <summary>Transforms coordinates back into closed compositions.</summary>
    /// <param name="request">The parts, transform, coordinates and total.</param>
    /// <param name="log">The request's completion event, for its shape fields.</param>
    /// <param name="cancellationToken">The request's token: the compute timeout, or a caller that goes away, stops the computation.</param>
    public static Results<TableOk<TableResponse>, ProblemHttpResult> Inverse(InverseRequest request, IDiagnosticContext log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        try
        {
            var names = request.Parts ?? throw TableRequest.Missing("/parts", "The request needs \"parts\": the part names of the compositions.");
            var parts = PartNames.Require(names);
            var type = TransformOption.RequireType(request.Transform);
            var width = Transforms.InverseWidth(type, parts.PartCount);
            double[] values;
            IReadOnlyList<string>? ids;
            if (request.Csv is { } csv)
            {
                if (csv.Columns.Count != width)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, "/rows", string.Create(CultureInfo.InvariantCulture, $"The CSV has {csv.Columns.Count} coordinate columns; {type} coordinates of {parts.PartCount} parts have {width}."));
                }

                (values, ids) = (csv.Values, csv.Ids);
            }
            else
            {
                var rows = request.Rows ?? throw TableRequest.Missing("/rows", "The request needs \"rows\": one array of coordinates per sample.");
                (values, ids) = (CoordinateInput.Flatten(rows, width), request.Ids);
            }

            log.Set("PartCount", parts.PartCount);
            log.Set("RowCount", values.Length / width);
            log.Set("Transform", type);
            var table = Transforms.Inverse(parts, request.Transform, values, request.Total ?? 1.0, ids, cancellationToken);
            return TableResults.Ok(TableResponse.From(table));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }
    }
}
