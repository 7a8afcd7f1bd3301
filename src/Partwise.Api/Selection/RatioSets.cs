using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Selection;
using Partwise.Core.Tables;

namespace Partwise.Api.Selection;

/// <summary>
/// The one path from ratio values back to compositions, shared by <c>/v1/ratio-sets/reconstruct</c> and the
/// <c>ratios</c> type of <c>/v1/coordinates/inverse</c>: <see cref="RatioReconstruction.Solve"/> (Greenacre 2020).
/// </summary>
public static class RatioSets
{
    /// <summary>
    /// Resolves the ratios at <paramref name="ratiosPointer"/> and reconstructs each row of values.
    /// </summary>
    /// <param name="parts">The validated part names (see <see cref="PartNames.Require"/>).</param>
    /// <param name="ratios">The ratio set as the request gives it.</param>
    /// <param name="values">n × k values, row-major (natural logs).</param>
    /// <param name="width">k, the number of values per row.</param>
    /// <param name="total">κ for the closure.</param>
    /// <param name="ids">Optional row ids.</param>
    /// <param name="ratiosPointer">Where the ratio list sits in the request: <c>/ratios</c> or <c>/transform/ratios</c>.</param>
    /// <param name="cancellationToken">Stops the per-row solve.</param>
    /// <exception cref="CompositionException">The Core's problems (incomplete, singular or ill-conditioned sets, values giving a part ≤ 0), with ratio pointers under <paramref name="ratiosPointer"/>.</exception>
    public static CompositionTable Reconstruct(
        CompositionTable parts,
        IReadOnlyList<RatioOption?>? ratios,
        double[] values,
        int width,
        double total,
        IReadOnlyList<string>? ids,
        string ratiosPointer,
        CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(values);
        LogRatio[] set = RatioOption.ToLogRatios(ratios, parts.Parts, ratiosPointer);
        var rows = new double[width == 0 ? 0 : values.Length / width][];
        for (var i = 0; i < rows.Length; i++)
        {
            rows[i] = values.AsSpan(i * width, width).ToArray();
        }

        CompositionTable table;
        try
        {
            table = RatioReconstruction.Solve(parts.Parts, set, rows, total, cancellationToken);
        }
        catch (CompositionException e) when (ratiosPointer != "/ratios")
        {
            // The Core points at "/ratios"; here the list sits elsewhere in the request.
            throw new CompositionException(e.ProblemType, e.Message, [.. e.Errors.Select(r => r.Pointer.StartsWith("/ratios", StringComparison.Ordinal) ? r with { Pointer = ratiosPointer + r.Pointer["/ratios".Length..] } : r)]);
        }

        return ids is null ? table : CompositionTable.FromValues(table.Parts, table.Values, ids);
    }
}
