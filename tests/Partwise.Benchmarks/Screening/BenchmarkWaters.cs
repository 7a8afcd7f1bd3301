namespace Partwise.Benchmarks.Screening;

/// <summary>
/// Seeded compositions of ten invented groundwater constituents for the screening benchmarks, with the pivot
/// coordinate map written here so the benchmarks do not depend on the library's transforms.
/// </summary>
internal static class BenchmarkWaters
{
    public static readonly string[] Parts = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3", "SiO2", "F"];

    private static readonly double[] Levels = [48, 12, 18, 2.5, 180, 24, 30, 6, 14, 0.3];

    /// <summary>n × 10 row-major values: correlated log-normal, the first share of rows drifting towards a saline mix.</summary>
    public static double[] Values(int seed, int n, double outlierShare)
    {
        var j = Parts.Length;
        var random = new Random(seed);
        var mixing = new double[j * j];
        for (var k = 0; k < mixing.Length; k++)
        {
            mixing[k] = 0.1 * Gaussian(random);
        }

        var values = new double[n * j];
        var g = new double[j];
        var outliers = (int)(outlierShare * n);
        for (var i = 0; i < n; i++)
        {
            for (var k = 0; k < j; k++)
            {
                g[k] = Gaussian(random);
            }

            for (var r = 0; r < j; r++)
            {
                var l = Math.Log(Levels[r]);
                for (var k = 0; k < j; k++)
                {
                    l += mixing[(r * j) + k] * g[k];
                }

                values[(i * j) + r] = Math.Exp(l + (i < outliers && r is 2 or 5 ? 2.0 : 0));
            }
        }

        return values;
    }

    /// <summary>Pivot coordinates z_i = √((J−i)/(J−i+1)) ln(x_i / g(x_{i+1..J})) (Fišerová &amp; Hron 2011), as a J × (J−1) map.</summary>
    public static double[] PivotMap(int j)
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

    /// <summary>(ln x) A for every row.</summary>
    public static double[] Coordinates(double[] values, double[] map, int j)
    {
        var p = map.Length / j;
        var n = values.Length / j;
        var y = new double[n * p];
        for (var i = 0; i < n; i++)
        {
            for (var r = 0; r < j; r++)
            {
                var l = Math.Log(values[(i * j) + r]);
                for (var c = 0; c < p; c++)
                {
                    y[(i * p) + c] += l * map[(r * p) + c];
                }
            }
        }

        return y;
    }

    private static double Gaussian(Random random)
    {
        var u1 = 1.0 - random.NextDouble();
        var u2 = random.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2.0 * Math.PI * u2);
    }
}
