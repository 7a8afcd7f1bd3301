using Partwise.Core.Problems;

namespace Partwise.Core.Tables;

/// <summary>
/// Closure C(x) = κ x / Σ x: rescales each composition to a constant total κ (Aitchison 1986, The Statistical
/// Analysis of Compositional Data, §2.2). Log-ratios are unchanged by it; it only fixes the units of the output.
/// </summary>
public static class Closure
{
    /// <summary>
    /// Closes every row of <paramref name="table"/> to <paramref name="total"/>.
    /// </summary>
    /// <param name="table">A validated table; a row whose sum is zero cannot be closed.</param>
    /// <param name="total">κ &gt; 0, finite (1 for proportions, 100 for percent, 10⁶ for ppm).</param>
    /// <param name="totalPointer">JSON pointer of the total option, for the problem when it is out of range.</param>
    /// <exception cref="CompositionException">A non-positive total, or a row that sums to zero.</exception>
    public static CompositionTable Close(CompositionTable table, double total = 1.0, string totalPointer = "/total")
    {
        ArgumentNullException.ThrowIfNull(table);
        RequireTotal(total, totalPointer);
        var j = table.PartCount;
        var values = (double[])table.Values.Clone();
        for (var i = 0; i < table.RowCount; i++)
        {
            if (!CloseRow(values.AsSpan(i * j, j), total))
            {
                throw new CompositionException(ProblemTypes.ZeroValue, $"/rows/{i}", $"Row {i} sums to zero and cannot be closed.");
            }
        }

        return table.WithValues(values);
    }

    /// <summary>
    /// Closes one row in place to <paramref name="total"/>; returns false when the row sums to zero. The row is
    /// divided by its largest value before summing, so values near the largest double do not overflow the sum.
    /// </summary>
    public static bool CloseRow(Span<double> row, double total)
    {
        var max = 0.0;
        foreach (var v in row)
        {
            max = Math.Max(max, v);
        }

        if (!(max > 0))
        {
            return false;
        }

        var sum = 0.0;
        foreach (var v in row)
        {
            sum += v / max;
        }

        var scale = total / sum;
        for (var k = 0; k < row.Length; k++)
        {
            row[k] = row[k] / max * scale;
        }

        return true;
    }

    /// <summary>Checks that a closure total is positive and finite.</summary>
    /// <exception cref="CompositionException">With <see cref="ProblemTypes.InvalidOption"/> at <paramref name="pointer"/>.</exception>
    public static void RequireTotal(double total, string pointer)
    {
        if (!double.IsFinite(total) || total <= 0)
        {
            throw new CompositionException(ProblemTypes.InvalidOption, pointer, "The total must be a positive finite number.");
        }
    }
}
