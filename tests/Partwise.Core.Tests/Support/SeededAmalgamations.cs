using Partwise.Core.Selection;
using Partwise.Core.Tables;

namespace Partwise.Core.Tests.Support;

/// <summary>
/// Seeded tables with structure (shared latent factors, so sums of parts carry signal) and seeded named amalgamations,
/// for the selection and evaluation tests. Invented data, generated here.
/// </summary>
public static class SeededAmalgamations
{
    /// <summary>
    /// An n × J table of mixtures: row i = Σ_k share_ik · endMember_k, times a log-normal measurement error of spread
    /// <paramref name="noise"/>. End members are log-normal around varied part levels; shares are closed log-normal draws.
    /// Mixing makes sums of parts carry signal that log-contrasts do not, as in water that mixes with another.
    /// </summary>
    public static CompositionTable Structured(int seed, int n, int parts, int endMembers = 3, double noise = 0.1)
    {
        var random = new Random(seed);
        var names = Enumerable.Range(0, parts).Select(j => $"p{j}").ToArray();
        var levels = Enumerable.Range(0, parts).Select(_ => (random.NextDouble() * 4) - 2).ToArray();
        var members = new double[endMembers, parts];
        for (var k = 0; k < endMembers; k++)
        {
            for (var j = 0; j < parts; j++)
            {
                members[k, j] = Math.Exp(levels[j] + (1.5 * SeededCompositions.Gaussian(random)));
            }
        }

        var values = new double[n * parts];
        var shares = new double[endMembers];
        for (var i = 0; i < n; i++)
        {
            var total = 0.0;
            for (var k = 0; k < endMembers; k++)
            {
                shares[k] = Math.Exp(1.2 * SeededCompositions.Gaussian(random));
                total += shares[k];
            }

            for (var j = 0; j < parts; j++)
            {
                var x = 0.0;
                for (var k = 0; k < endMembers; k++)
                {
                    x += shares[k] / total * members[k, j];
                }

                values[(i * parts) + j] = x * Math.Exp(noise * SeededCompositions.Gaussian(random));
            }
        }

        return CompositionTable.FromValues(names, values);
    }

    /// <summary>
    /// <paramref name="count"/> distinct named amalgamations <c>s0</c>, <c>s1</c>, … of 2 to 4 parts of a table with parts
    /// <c>p0 … p(J−1)</c>; some overlap, so the no-common-part rule for two amalgamations is exercised.
    /// </summary>
    public static IReadOnlyList<NamedAmalgamation> Amalgamations(int seed, int parts, int count)
    {
        var random = new Random(seed);
        var result = new List<NamedAmalgamation>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        while (result.Count < count)
        {
            var size = random.Next(2, Math.Min(4, parts - 1) + 1);
            var members = Enumerable.Range(0, parts).OrderBy(_ => random.Next()).Take(size).Order().ToArray();
            var key = string.Join(',', members);
            if (seen.Add(key))
            {
                result.Add(new NamedAmalgamation($"s{result.Count}", [.. members.Select(j => $"p{j}")]));
            }
        }

        return result;
    }

    /// <summary>The part index sets of amalgamations over a table.</summary>
    public static int[][] Indices(CompositionTable table, IReadOnlyList<NamedAmalgamation> amalgamations) =>
        [.. amalgamations.Select(a => a.Parts.Select(p => table.IndexOf(p)).ToArray())];

    /// <summary>The major ions of an invented monitoring network (mg/L): baseline wells plus a share drifting towards a saline mix.</summary>
    public static CompositionTable Groundwater(int seed, int n)
    {
        string[] parts = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3"];
        double[] baseline = [60, 15, 20, 3, 250, 25, 40, 8];
        double[] saline = [400, 1200, 10000, 380, 140, 19000, 2600, 1];
        var random = new Random(seed);
        var values = new double[n * parts.Length];
        for (var i = 0; i < n; i++)
        {
            // Mixing share of the saline end member: small for most samples, growing for a drifting well.
            var share = i % 5 == 0 ? 0.002 + (0.05 * random.NextDouble()) : 0.001 * random.NextDouble();
            var dilution = Math.Exp(0.3 * SeededCompositions.Gaussian(random));
            for (var j = 0; j < parts.Length; j++)
            {
                var mix = ((1 - share) * baseline[j] * dilution) + (share * saline[j]);
                values[(i * parts.Length) + j] = mix * Math.Exp(0.15 * SeededCompositions.Gaussian(random));
            }
        }

        return CompositionTable.FromValues(parts, values);
    }

    /// <summary>Named amalgamations of the groundwater table: hardness (Ca + Mg), alkalis (Na + K), strongAcids (Cl + SO4 + NO3).</summary>
    public static IReadOnlyList<NamedAmalgamation> GroundwaterAmalgamations { get; } =
    [
        new("hardness", ["Ca", "Mg"]),
        new("alkalis", ["Na", "K"]),
        new("strongAcids", ["Cl", "SO4", "NO3"]),
    ];

    /// <summary>Equal weights 1/J.</summary>
    public static double[] Equal(int parts) => [.. Enumerable.Repeat(1.0 / parts, parts)];

    /// <summary>Seeded unequal positive weights summing to 1.</summary>
    public static double[] Unequal(int seed, int parts)
    {
        var random = new Random(seed);
        var w = Enumerable.Range(0, parts).Select(_ => 0.2 + random.NextDouble()).ToArray();
        var s = w.Sum();
        return [.. w.Select(v => v / s)];
    }
}
