using Partwise.Core.Tables;
using Partwise.Core.Transforms;

namespace Partwise.Core.Variance;

/// <summary>
/// The Aitchison distance d_A(x, y) = ‖clr(x) − clr(y)‖ (Aitchison 1986; Aitchison, Barceló-Vidal, Martín-Fernández
/// &amp; Pawlowsky-Glahn 2000, Math. Geol. 32:271-275). It equals the Euclidean distance of ilr coordinates in any
/// orthonormal basis.
/// </summary>
public static class AitchisonDistance
{
    /// <summary>The n × n matrix of distances between the rows of a strictly positive table, row-major.</summary>
    /// <param name="table">Strictly positive (apply a zero policy first). Memory is 8 n² bytes: callers cap n.</param>
    /// <param name="cancellationToken">Looked at every row; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    public static double[] Matrix(CompositionTable table, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(table);
        var n = table.RowCount;
        var j = table.PartCount;
        var clr = Clr.Forward(table, null, cancellationToken).Values;
        var result = new double[checked(n * n)];
        for (var a = 0; a < n; a++)
        {
            // Each row is up to n distances of J terms: look at every row.
            cancellationToken.ThrowIfCancellationRequested();
            var ra = clr.AsSpan(a * j, j);
            for (var b = a + 1; b < n; b++)
            {
                var rb = clr.AsSpan(b * j, j);
                var s = 0.0;
                for (var k = 0; k < j; k++)
                {
                    var diff = ra[k] - rb[k];
                    s += diff * diff;
                }

                var d = Math.Sqrt(s);
                result[(a * n) + b] = d;
                result[(b * n) + a] = d;
            }
        }

        return result;
    }

    /// <summary>The distance between two strictly positive compositions of the same parts.</summary>
    public static double Between(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        if (x.Length != y.Length)
        {
            throw new ArgumentException("Both compositions need the same parts.", nameof(y));
        }

        double mx = 0, my = 0;
        for (var k = 0; k < x.Length; k++)
        {
            mx += Math.Log(x[k]);
            my += Math.Log(y[k]);
        }

        mx /= x.Length;
        my /= x.Length;
        var s = 0.0;
        for (var k = 0; k < x.Length; k++)
        {
            var diff = Math.Log(x[k]) - mx - (Math.Log(y[k]) - my);
            s += diff * diff;
        }

        return Math.Sqrt(s);
    }
}
