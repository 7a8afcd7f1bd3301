namespace Partwise.Core.Transforms;

/// <summary>
/// Pivot coordinates z_i = √((J − i) / (J − i + 1)) ln(x_i / g(x_{i+1}, …, x_J)), i = 1 … J − 1
/// (Fišerová &amp; Hron 2011, Math. Geosci. 43:455-468): the first coordinate carries all the relative
/// information about the first part. The default ilr basis.
/// </summary>
public static class PivotBasis
{
    /// <summary>The pivot basis for <paramref name="parts"/> in their given order.</summary>
    /// <param name="parts">J ≥ 2 part names.</param>
    public static IlrBasis Create(IReadOnlyList<string> parts)
    {
        ArgumentNullException.ThrowIfNull(parts);
        var j = parts.Count;
        ArgumentOutOfRangeException.ThrowIfLessThan(j, 2);
        var d = j - 1;
        var v = new double[j * d];
        var labels = new string[d];
        for (var i = 0; i < d; i++)
        {
            // With 0-based i there are m = J − i − 1 parts after the pivot.
            double m = j - i - 1;
            var factor = Math.Sqrt(m / (m + 1));
            v[(i * d) + i] = factor;
            for (var k = i + 1; k < j; k++)
            {
                v[(k * d) + i] = -factor / m;
            }

            labels[i] = IlrBasis.BalanceLabel(parts, [i], Enumerable.Range(i + 1, j - i - 1));
        }

        return new IlrBasis([.. parts], v, labels);
    }
}
