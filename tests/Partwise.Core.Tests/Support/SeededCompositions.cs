using Partwise.Core.Tables;

namespace Partwise.Core.Tests.Support;

/// <summary>Seeded random compositions for identities and properties (log-normal parts, so all positive).</summary>
public static class SeededCompositions
{
    /// <summary>An n × J table with log-normal values of spread <paramref name="sigma"/> around varied part levels.</summary>
    public static CompositionTable Table(int seed, int n, int parts, double sigma = 0.8)
    {
        var random = new Random(seed);
        var names = Enumerable.Range(0, parts).Select(j => $"p{j}").ToArray();
        var levels = Enumerable.Range(0, parts).Select(_ => (random.NextDouble() * 4) - 2).ToArray();
        var values = new double[n * parts];
        for (var i = 0; i < n; i++)
        {
            for (var j = 0; j < parts; j++)
            {
                values[(i * parts) + j] = Math.Exp(levels[j] + (sigma * Gaussian(random)));
            }
        }

        return CompositionTable.FromValues(names, values);
    }

    /// <summary>A standard normal draw (Box–Muller).</summary>
    public static double Gaussian(Random random)
    {
        ArgumentNullException.ThrowIfNull(random);
        var u1 = 1.0 - random.NextDouble();
        var u2 = random.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2.0 * Math.PI * u2);
    }
}
