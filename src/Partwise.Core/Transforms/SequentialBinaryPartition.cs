using Partwise.Core.Problems;

namespace Partwise.Core.Transforms;

/// <summary>
/// An ilr basis from a sequential binary partition (SBP): J − 1 rows of signs +1/−1/0, each splitting one group of
/// parts into two. A row with r parts "+1" and s parts "−1" gives coefficients +√(s / (r (r + s))) and
/// −√(r / (s (r + s))), the balance √(r s / (r + s)) ln(g(+) / g(−)) (Egozcue &amp; Pawlowsky-Glahn 2005,
/// Math. Geol. 37:795-828).
/// </summary>
public static class SequentialBinaryPartition
{
    /// <summary>
    /// Validates <paramref name="signs"/> as a sequential binary partition and builds its basis.
    /// </summary>
    /// <param name="parts">The J part names.</param>
    /// <param name="signs">J − 1 rows of J values in {−1, 0, 1}. Rows may come in any order as long as they form a
    /// hierarchy: the first split (by size) covers every part, and each later row splits exactly one group made by
    /// an earlier split.</param>
    /// <param name="pointer">JSON pointer of the partition, usually <c>/transform/partition</c>.</param>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.InvalidPartition"/> at the offending row.</exception>
    public static IlrBasis ToBasis(IReadOnlyList<string> parts, IReadOnlyList<int[]> signs, string pointer = "/transform/partition")
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(signs);
        var j = parts.Count;
        var d = j - 1;
        if (signs.Count != d)
        {
            throw new CompositionException(ProblemTypes.InvalidPartition, pointer, $"A sequential binary partition of {j} parts has {d} rows; this one has {signs.Count}.");
        }

        for (var r = 0; r < d; r++)
        {
            var row = signs[r];
            if (row is null || row.Length != j)
            {
                throw new CompositionException(ProblemTypes.InvalidPartition, $"{pointer}/{r}", $"Each partition row needs {j} signs, one per part.");
            }

            for (var k = 0; k < j; k++)
            {
                if (row[k] is < -1 or > 1)
                {
                    throw new CompositionException(ProblemTypes.InvalidPartition, $"{pointer}/{r}/{k}", "Partition signs are +1, -1 or 0.");
                }
            }

            if (!row.Contains(1) || !row.Contains(-1))
            {
                throw new CompositionException(ProblemTypes.InvalidPartition, $"{pointer}/{r}", "Each partition row needs at least one +1 part and one -1 part.");
            }
        }

        // Process rows by decreasing support so that a parent split always comes before its children.
        var order = Enumerable.Range(0, d).OrderByDescending(r => signs[r].Count(s => s != 0)).ThenBy(r => r).ToArray();
        var open = new List<HashSet<int>> { Enumerable.Range(0, j).ToHashSet() };
        foreach (var r in order)
        {
            var support = Enumerable.Range(0, j).Where(k => signs[r][k] != 0).ToHashSet();
            var group = open.FindIndex(g => g.SetEquals(support));
            if (group < 0)
            {
                throw new CompositionException(ProblemTypes.InvalidPartition, $"{pointer}/{r}", "This row does not split a group made by an earlier split (the first split must cover every part, and each group of two or more parts is split exactly once).");
            }

            open.RemoveAt(group);
            foreach (var sign in new[] { 1, -1 })
            {
                var side = support.Where(k => signs[r][k] == sign).ToHashSet();
                if (side.Count > 1)
                {
                    open.Add(side);
                }
            }
        }

        var v = new double[j * d];
        var labels = new string[d];
        for (var r = 0; r < d; r++)
        {
            var plus = Enumerable.Range(0, j).Where(k => signs[r][k] == 1).ToArray();
            var minus = Enumerable.Range(0, j).Where(k => signs[r][k] == -1).ToArray();
            double p = plus.Length, m = minus.Length;
            var a = Math.Sqrt(m / (p * (p + m)));
            var b = -Math.Sqrt(p / (m * (p + m)));
            foreach (var k in plus)
            {
                v[(k * d) + r] = a;
            }

            foreach (var k in minus)
            {
                v[(k * d) + r] = b;
            }

            labels[r] = IlrBasis.BalanceLabel(parts, plus, minus);
        }

        return new IlrBasis([.. parts], v, labels);
    }
}
