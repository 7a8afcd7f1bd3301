using System.Globalization;
using System.Text;

namespace Partwise.Api.Tests.Support;

/// <summary>Seeded log-normal tables for HTTP tests, as JSON table fields (invented numbers, no real data).</summary>
public static class SeededTable
{
    /// <summary>n × J positive values around part levels spread over two orders of magnitude.</summary>
    public static double[][] Values(int seed, int n, int j)
    {
        var random = new Random(seed);
        var levels = Enumerable.Range(0, j).Select(_ => (random.NextDouble() * 4) - 1).ToArray();
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        return [.. Enumerable.Range(0, n).Select(_ => levels.Select(l => Math.Exp(l + (0.7 * Normal()))).ToArray())];
    }

    /// <summary>Part names p1 … pJ.</summary>
    public static string[] Parts(int j) => [.. Enumerable.Range(1, j).Select(k => "p" + k.ToString(CultureInfo.InvariantCulture))];

    /// <summary>The JSON fields <c>"parts": [...], "rows": [...]</c> (and ids s0 … when asked).</summary>
    public static string Fields(double[][] rows, bool ids = false)
    {
        var j = rows[0].Length;
        var sb = new StringBuilder("\"parts\": [").AppendJoin(", ", Parts(j).Select(p => "\"" + p + "\"")).Append("], \"rows\": ");
        sb.Append(Matrix(rows));
        if (ids)
        {
            sb.Append(", \"ids\": [").AppendJoin(", ", Enumerable.Range(0, rows.Length).Select(i => "\"s" + i.ToString(CultureInfo.InvariantCulture) + "\"")).Append(']');
        }

        return sb.ToString();
    }

    /// <summary>A matrix as JSON with round-trip numbers.</summary>
    public static string Matrix(IEnumerable<double[]> rows) =>
        "[" + string.Join(", ", rows.Select(r => "[" + string.Join(", ", r.Select(v => v.ToString("R", CultureInfo.InvariantCulture))) + "]")) + "]";

    /// <summary>The sample covariance (divisor n − 1) of the columns of <paramref name="g"/> (common practice).</summary>
    public static double[][] Covariance(double[][] g)
    {
        int n = g.Length, m = g[0].Length;
        var mean = new double[m];
        foreach (var row in g)
        {
            for (var c = 0; c < m; c++)
            {
                mean[c] += row[c] / n;
            }
        }

        var cov = new double[m][];
        for (var a = 0; a < m; a++)
        {
            cov[a] = new double[m];
            for (var b = 0; b < m; b++)
            {
                cov[a][b] = g.Sum(r => (r[a] - mean[a]) * (r[b] - mean[b])) / (n - 1);
            }
        }

        return cov;
    }
}
