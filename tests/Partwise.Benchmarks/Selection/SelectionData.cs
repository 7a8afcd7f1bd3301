using Partwise.Core.Selection;
using Partwise.Core.Tables;

namespace Partwise.Benchmarks.Selection;

/// <summary>Seeded mixtures of log-normal end members with named amalgamations, for the selection benchmarks.</summary>
public static class SelectionData
{
    /// <summary>An n × J table: row i = Σ_k share_ik end_k times a log-normal error (seeded).</summary>
    public static CompositionTable Mixtures(int seed, int n, int parts, int endMembers = 4)
    {
        var random = new Random(seed);
        var names = Enumerable.Range(0, parts).Select(j => $"p{j}").ToArray();
        var members = new double[endMembers * parts];
        for (var k = 0; k < members.Length; k++)
        {
            members[k] = Math.Exp((random.NextDouble() * 4) - 2 + (1.5 * Gaussian(random)));
        }

        var values = new double[n * parts];
        var shares = new double[endMembers];
        for (var i = 0; i < n; i++)
        {
            var total = 0.0;
            for (var k = 0; k < endMembers; k++)
            {
                shares[k] = Math.Exp(1.2 * Gaussian(random));
                total += shares[k];
            }

            for (var j = 0; j < parts; j++)
            {
                var x = 0.0;
                for (var k = 0; k < endMembers; k++)
                {
                    x += shares[k] / total * members[(k * parts) + j];
                }

                values[(i * parts) + j] = x * Math.Exp(0.1 * Gaussian(random));
            }
        }

        return CompositionTable.FromValues(names, values);
    }

    /// <summary><paramref name="count"/> distinct amalgamations <c>s0</c>, … of 2 to 5 parts (seeded).</summary>
    public static IReadOnlyList<NamedAmalgamation> Amalgamations(int seed, int parts, int count)
    {
        var random = new Random(seed);
        var result = new List<NamedAmalgamation>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        while (result.Count < count)
        {
            var members = Enumerable.Range(0, parts).OrderBy(_ => random.Next()).Take(random.Next(2, 6)).Order().ToArray();
            if (seen.Add(string.Join(',', members)))
            {
                result.Add(new NamedAmalgamation($"s{result.Count}", [.. members.Select(j => $"p{j}")]));
            }
        }

        return result;
    }

    /// <summary>The moments the contract takes: covariance with divisor n − 1 of the part logs and amalgamation-sum logs.</summary>
    public static SelectionMoments Moments(CompositionTable table, IReadOnlyList<NamedAmalgamation> amalgamations)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(amalgamations);
        var sums = amalgamations.Select(a => a.Parts.Select(table.IndexOf).ToArray()).ToArray();
        var k0 = AugmentedGram.Compute(table, sums);
        var m = table.PartCount + sums.Length;
        var n = table.RowCount;
        var cov = new double[m][];
        for (var r = 0; r < m; r++)
        {
            cov[r] = new double[m];
            for (var c = 0; c < m; c++)
            {
                cov[r][c] = k0[(r * m) + c] * n / (n - 1);
            }
        }

        return new SelectionMoments([.. table.Parts, .. amalgamations.Select(a => a.Name)], cov, n);
    }

    private static double Gaussian(Random random)
    {
        var u1 = 1.0 - random.NextDouble();
        var u2 = random.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2.0 * Math.PI * u2);
    }
}
