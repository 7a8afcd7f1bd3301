using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

/// <summary>
/// Coordinate maps A (J × p, row-major, coordinates = (ln x) A) written here for the screening tests only, so that
/// the tests do not lean on the library's own transforms.
/// </summary>
internal static class CoordinateMaps
{
    /// <summary>
    /// Pivot coordinates z_i = √((J−i)/(J−i+1)) ln(x_i / g(x_{i+1..J})), i = 1..J−1 (Fišerová &amp; Hron 2011,
    /// Math. Geosci. 43:455-468): column i has √((J−i)/(J−i+1)) at part i and −√((J−i)/(J−i+1))/(J−i) at each later part.
    /// </summary>
    public static double[] Pivot(int j)
    {
        var p = j - 1;
        var a = new double[j * p];
        for (var c = 0; c < p; c++)
        {
            var rest = j - c - 1;
            var factor = Math.Sqrt(rest / (rest + 1.0));
            a[(c * p) + c] = factor;
            for (var r = c + 1; r < j; r++)
            {
                a[(r * p) + c] = -factor / rest;
            }
        }

        return a;
    }

    /// <summary>alr_i = ln(x_i / x_J), i = 1..J−1 (Aitchison 1986): A = [I; −1ᵀ].</summary>
    public static double[] Alr(int j)
    {
        var p = j - 1;
        var a = new double[j * p];
        for (var c = 0; c < p; c++)
        {
            a[(c * p) + c] = 1;
            a[((j - 1) * p) + c] = -1;
        }

        return a;
    }

    /// <summary>One column e_a − e_b per pairwise ratio ln(x_a / x_b).</summary>
    public static double[] Pairwise(int j, params (int Num, int Den)[] ratios)
    {
        var p = ratios.Length;
        var a = new double[j * p];
        for (var c = 0; c < p; c++)
        {
            a[(ratios[c].Num * p) + c] = 1;
            a[(ratios[c].Den * p) + c] = -1;
        }

        return a;
    }

    /// <summary>(ln x) A for every row of the table: n × p, row-major.</summary>
    public static double[] Apply(CompositionTable table, double[] map)
    {
        var j = table.PartCount;
        var p = map.Length / j;
        var y = new double[table.RowCount * p];
        for (var i = 0; i < table.RowCount; i++)
        {
            var row = table.Row(i);
            for (var r = 0; r < j; r++)
            {
                var l = Math.Log(row[r]);
                for (var c = 0; c < p; c++)
                {
                    y[(i * p) + c] += l * map[(r * p) + c];
                }
            }
        }

        return y;
    }

    /// <summary>The rows of a row-major matrix as jagged arrays, for JSON to the Python reference.</summary>
    public static double[][] Rows(double[] values, int width) =>
        [.. Enumerable.Range(0, values.Length / width).Select(i => values.AsSpan(i * width, width).ToArray())];
}

/// <summary>
/// Seeded groundwater compositions for the screening tests: an invented monitoring network whose reference period
/// has correlated log-normal major ions, with an optional share of gross outliers drifting towards a saline mix.
/// </summary>
internal static class MonitoringData
{
    public static readonly string[] Ions = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3"];

    // Typical levels in mg/L of the invented network's reference period.
    private static readonly double[] Levels = [48, 12, 18, 2.5, 180, 24, 30, 6];

    /// <summary>
    /// n samples: ln x = ln level + M g with g standard normal and M a fixed, seeded mixing matrix (spread about
    /// <paramref name="spread"/>); the first ⌊outlierShare·n⌋ rows get Na and Cl raised e^<paramref name="shift"/>-fold.
    /// </summary>
    public static CompositionTable Reference(int seed, int n, double outlierShare = 0, double spread = 0.25, double shift = 2.5)
    {
        var j = Ions.Length;
        var random = new Random(seed);
        var mixing = new double[j * j];
        for (var k = 0; k < mixing.Length; k++)
        {
            mixing[k] = spread * SeededCompositions.Gaussian(random) / Math.Sqrt(2);
        }

        var outliers = (int)Math.Floor(outlierShare * n);
        var values = new double[n * j];
        var g = new double[j];
        for (var i = 0; i < n; i++)
        {
            for (var k = 0; k < j; k++)
            {
                g[k] = SeededCompositions.Gaussian(random);
            }

            for (var r = 0; r < j; r++)
            {
                var l = Math.Log(Levels[r]);
                for (var k = 0; k < j; k++)
                {
                    l += mixing[(r * j) + k] * g[k];
                }

                if (i < outliers && (Ions[r] == "Na" || Ions[r] == "Cl"))
                {
                    l += shift;
                }

                values[(i * j) + r] = Math.Exp(l);
            }
        }

        return CompositionTable.FromValues(Ions, values);
    }

    /// <summary>Row i of the table as values by part name.</summary>
    public static Dictionary<string, double> Sample(CompositionTable table, int i) =>
        table.Parts.Select((name, k) => (name, k)).ToDictionary(t => t.name, t => table.Row(i)[t.k], StringComparer.Ordinal);
}
