namespace Partwise.Core.Screening;

/// <summary>
/// The pairwise log-ratios ln(x_i / x_j), i &lt; j in part order, that a baseline can explain, with their clr-form
/// mean mᵢⱼ = μ_clr,i − μ_clr,j and standard deviation sᵢⱼ = √(S_ii + S_jj − 2 S_ij), precomputed once so that a
/// screening costs O(1) per pair (see <see cref="Baseline"/>).
/// </summary>
internal sealed class PairTable
{
    // A pair is explained when ‖P (e_i − e_j)‖² = P_ii + P_jj − 2 P_ij equals ‖e_i − e_j‖² = 2 to this tolerance.
    private const double SpanTolerance = 1e-9;

    private PairTable(int[] first, int[] second, double[] mean, double[] inverseSd, double[] low, double[] high, string[] labels)
    {
        First = first;
        Second = second;
        Mean = mean;
        InverseSd = inverseSd;
        Low = low;
        High = high;
        Labels = labels;
    }

    internal int Count => First.Length;

    internal int[] First { get; }

    internal int[] Second { get; }

    internal double[] Mean { get; }

    internal double[] InverseSd { get; }

    internal double[] Low { get; }

    internal double[] High { get; }

    internal string[] Labels { get; }

    internal static PairTable Create(string[] parts, double[] map, int p, double[] clrLocation, double[] clrScatter)
    {
        var j = parts.Length;
        var projector = Projector(map, j, p);
        var first = new List<int>();
        var second = new List<int>();
        var mean = new List<double>();
        var inverseSd = new List<double>();
        var low = new List<double>();
        var high = new List<double>();
        var labels = new List<string>();
        for (var a = 0; a < j; a++)
        {
            for (var b = a + 1; b < j; b++)
            {
                var seen = projector[(a * j) + a] + projector[(b * j) + b] - (2 * projector[(a * j) + b]);
                if (Math.Abs(seen - 2) > 2 * SpanTolerance)
                {
                    continue;
                }

                var variance = clrScatter[(a * j) + a] + clrScatter[(b * j) + b] - (2 * clrScatter[(a * j) + b]);
                if (!(variance > 0))
                {
                    continue;
                }

                var m = clrLocation[a] - clrLocation[b];
                var sd = Math.Sqrt(variance);
                first.Add(a);
                second.Add(b);
                mean.Add(m);
                inverseSd.Add(1 / sd);
                low.Add(Math.Exp(m - (Baseline.ExpectedRangeZ * sd)));
                high.Add(Math.Exp(m + (Baseline.ExpectedRangeZ * sd)));
                labels.Add(parts[a] + "/" + parts[b]);
            }
        }

        return new PairTable([.. first], [.. second], [.. mean], [.. inverseSd], [.. low], [.. high], [.. labels]);
    }

    // P = A (AᵀA)⁻¹ Aᵀ, the orthogonal projector onto the column space of A (J × J).
    private static double[] Projector(double[] map, int j, int p)
    {
        var a = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(j, p, (r, c) => map[(r * p) + c]);
        var ata = a.TransposeThisAndMultiply(a);
        return (a * ata.Cholesky().Solve(a.Transpose())).ToRowMajorArray();
    }
}
