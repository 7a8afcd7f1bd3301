using Partwise.Core.Ratios;

namespace Partwise.Core.Selection;

/// <summary>
/// The columns of the augmented log matrix G = [ln x_1 … ln x_J, ln s_1 … ln s_m, ln s_(m+1) …]: the parts, the named
/// amalgamations' sums in the order given, then sums that a given ratio needs and no amalgamation names (Greenacre 2019,
/// Math. Geosci. 51:649-682, where every candidate is G b). A ratio is then a coefficient vector b over these columns:
/// e_p − e_q for pairwise and amalgamation ratios, the balance's log-contrast over the part columns for a balance.
/// </summary>
internal sealed class AugmentedColumns
{
    private readonly List<int[]> _sums = [];

    public AugmentedColumns(int partCount, IEnumerable<int[]> namedSums)
    {
        PartCount = partCount;
        foreach (var s in namedSums)
        {
            _sums.Add(Sorted(s));
        }

        NamedCount = _sums.Count;
    }

    public int PartCount { get; }

    public int NamedCount { get; }

    /// <summary>The part sets of every sum column, named first.</summary>
    public IReadOnlyList<int[]> Sums => _sums;

    /// <summary>M = J + the number of sum columns.</summary>
    public int Count => PartCount + _sums.Count;

    /// <summary>The column holding ln of the side's sum: the part's own column, a named or added sum, or −1.</summary>
    public int Find(IReadOnlyList<int> side)
    {
        if (side.Count == 1)
        {
            return side[0];
        }

        var sorted = Sorted(side);
        for (var c = 0; c < _sums.Count; c++)
        {
            if (_sums[c].AsSpan().SequenceEqual(sorted))
            {
                return PartCount + c;
            }
        }

        return -1;
    }

    /// <summary>The side's column, adding a sum column when no column holds it yet.</summary>
    public int FindOrAdd(IReadOnlyList<int> side)
    {
        var c = Find(side);
        if (c >= 0)
        {
            return c;
        }

        _sums.Add(Sorted(side));
        return Count - 1;
    }

    /// <summary>
    /// The ratio's non-zero coefficients over the columns; for an amalgamation ratio both sides must already have a column
    /// (<see cref="FindOrAdd"/>), else this returns null.
    /// </summary>
    public (int Column, double Value)[]? Coefficients(LogRatio ratio)
    {
        if (ratio.Kind == RatioKind.Balance)
        {
            var a = ratio.LogContrast(PartCount)!;
            var list = new List<(int, double)>();
            for (var j = 0; j < a.Length; j++)
            {
                if (a[j] != 0)
                {
                    list.Add((j, a[j]));
                }
            }

            return [.. list];
        }

        int p = Find(ratio.Numerator), q = Find(ratio.Denominator);
        return p < 0 || q < 0 ? null : [(p, 1.0), (q, -1.0)];
    }

    /// <summary>Writes the dense vector b (length <see cref="Count"/>) of sparse coefficients.</summary>
    public static void Dense((int Column, double Value)[] coefficients, Span<double> b)
    {
        b.Clear();
        foreach (var (c, v) in coefficients)
        {
            b[c] += v;
        }
    }

    private static int[] Sorted(IReadOnlyList<int> side)
    {
        var s = side.ToArray();
        Array.Sort(s);
        return s;
    }
}
