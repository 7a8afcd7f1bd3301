using System.Globalization;
using Partwise.Api.Selection;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Tables;
using Partwise.Core.Transforms;
using Partwise.Core.Variance;

namespace Partwise.Api.Coordinates;

/// <summary>Calls the math library's forward and inverse transforms for a <see cref="TransformOption"/>.</summary>
public static class Transforms
{
    /// <summary>The coordinates of a strictly positive table, and the ilr basis when the transform is ilr.</summary>
    /// <param name="table">Zeros already replaced.</param>
    /// <param name="option">The transform.</param>
    /// <param name="maxValues">The most numbers the result may hold.</param>
    /// <param name="cancellationToken">Stops the transform's row loop.</param>
    /// <exception cref="CompositionException">Bad options (400/422), or a result over <paramref name="maxValues"/> (422).</exception>
    public static (LogRatioCoordinates Coordinates, IlrBasis? Basis) Forward(CompositionTable table, TransformOption? option, long maxValues, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var type = TransformOption.RequireType(option);
        var j = table.PartCount;
        long width = type switch
        {
            "clr" => j,
            "pairwise" => (long)j * (j - 1) / 2,
            "ratios" => option!.Ratios?.Count ?? 0,
            _ => j - 1,
        };
        RequireResultSize(table.RowCount, width, maxValues);
        switch (type)
        {
            case "clr":
                var weights = option!.Weights is null ? null : PartWeights.Resolve(WeightsOption.ToSpec(option.Weights, "/transform/weights"), table, "/transform/weights");
                return (Clr.Forward(table, weights, cancellationToken), null);
            case "alr":
                return (Alr.Forward(table, Denominator(table, option!), cancellationToken), null);
            case "ilr":
                var basis = Basis(table.Parts, option!);
                return (Ilr.Forward(table, basis, cancellationToken), basis);
            case "pairwise":
                return (PairwiseLogRatios.Forward(table, cancellationToken), null);
            default:
                if (option!.Ratios is not { Count: > 0 } ratios)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, "/transform/ratios", "The ratios transform needs \"ratios\": a list of one or more ratios.");
                }

                var set = ratios.Select((r, i) => (r ?? throw new CompositionException(ProblemTypes.InvalidInput, $"/transform/ratios/{i}", "A ratio must be an object, not null."))
                    .ToLogRatio(table.Parts, string.Create(CultureInfo.InvariantCulture, $"/transform/ratios/{i}"))).ToArray();
                return (RatioSetTransform.Forward(table, set, cancellationToken), null);
        }
    }

    /// <summary>The number of coordinates per row that the inverse of <paramref name="type"/> takes for J parts.</summary>
    public static int InverseWidth(string type, int partCount) => type == "clr" ? partCount : partCount - 1;

    /// <summary>
    /// The closed composition for each row of coordinates. <c>clr</c>: C(exp(y)); <c>alr</c>: C([exp(y), 1]) with the 1
    /// at the denominator; <c>ilr</c>: C(exp(V z)) (Egozcue et al. 2003); <c>ratios</c>: a complete set of J − 1 ratios solved
    /// for the composition (Greenacre 2020). Pairwise coordinates are refused.
    /// </summary>
    /// <param name="parts">A validated one-row table over the output's part names (see <see cref="PartNames.Require"/>).</param>
    /// <param name="option">The transform the coordinates were made with.</param>
    /// <param name="values">n × width coordinates, row-major.</param>
    /// <param name="total">κ for the closure.</param>
    /// <param name="ids">Optional row ids.</param>
    /// <param name="cancellationToken">Stops the inverse's row loop.</param>
    public static CompositionTable Inverse(CompositionTable parts, TransformOption? option, double[] values, double total, IReadOnlyList<string>? ids, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(parts);
        var type = TransformOption.RequireType(option);
        switch (type)
        {
            case "clr":
                return Clr.Inverse(parts.Parts, values, total, ids, cancellationToken);
            case "alr":
                return Alr.Inverse(parts.Parts, Denominator(parts, option!), values, total, ids, cancellationToken);
            case "ilr":
                return Ilr.Inverse(Basis(parts.Parts, option!), values, total, ids, cancellationToken);
            case "pairwise":
                throw new CompositionException(ProblemTypes.InvalidOption, "/transform/type", "Pairwise log-ratios are not inverted here: all J(J − 1)/2 of them over-determine a composition. Send clr, alr or ilr coordinates.");
            default:
                // The same back-transform as /v1/ratio-sets/reconstruct (Greenacre 2020).
                return RatioSets.Reconstruct(parts, option!.Ratios, values, parts.PartCount - 1, total, ids, "/transform/ratios", cancellationToken);
        }
    }

    /// <summary>Refuses a result of n × width numbers over the limit with a 422 computation-limit problem.</summary>
    public static void RequireResultSize(long rows, long width, long maxValues)
    {
        if (rows * width > maxValues)
        {
            throw new CompositionException(
                ProblemTypes.ComputationLimit,
                "/transform",
                string.Create(CultureInfo.InvariantCulture, $"The result would hold {rows} × {width} = {rows * width} numbers; at most {maxValues} are computed in one request. Send fewer rows or parts, or a smaller transform."));
        }
    }

    private static int Denominator(CompositionTable table, TransformOption option) =>
        option.Denominator is { } name ? table.RequireIndex(name, "/transform/denominator") : table.PartCount - 1;

    private static IlrBasis Basis(IReadOnlyList<string> parts, TransformOption option) =>
        option.Partition is { } partition
            ? SequentialBinaryPartition.ToBasis(parts, partition, "/transform/partition")
            : PivotBasis.Create(parts);
}
