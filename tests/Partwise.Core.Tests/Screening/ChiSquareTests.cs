using Partwise.Core.Screening;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

public class ChiSquareTests
{
    // NIST/SEMATECH e-Handbook of Statistical Methods, table 1.3.6.7.4 "Critical Values of the Chi-Square
    // Distribution", upper-tail critical values χ²(1 − α; ν), printed to 3 decimals. From the NIST table, from memory
    // (each also checked against scipy.stats.chi2.ppf below).
    [Theory]
    [InlineData(1, 0.10, 2.706)]
    [InlineData(1, 0.05, 3.841)]
    [InlineData(1, 0.025, 5.024)]
    [InlineData(1, 0.01, 6.635)]
    [InlineData(1, 0.001, 10.828)]
    [InlineData(2, 0.05, 5.991)]
    [InlineData(2, 0.025, 7.378)]
    [InlineData(2, 0.001, 13.816)]
    [InlineData(3, 0.025, 9.348)]
    [InlineData(5, 0.05, 11.070)]
    [InlineData(5, 0.025, 12.833)]
    [InlineData(5, 0.01, 15.086)]
    [InlineData(9, 0.10, 14.684)]
    [InlineData(9, 0.05, 16.919)]
    [InlineData(9, 0.025, 19.023)]
    [InlineData(9, 0.01, 21.666)]
    [InlineData(9, 0.001, 27.877)]
    [InlineData(10, 0.05, 18.307)]
    [InlineData(10, 0.025, 20.483)]
    [InlineData(10, 0.001, 29.588)]
    public void UpperCriticalValuesMatchTheNistTable(int degreesOfFreedom, double alpha, double table)
    {
        Tolerance.Close(table, ChiSquare.Quantile(1 - alpha, degreesOfFreedom), abs: 5e-4, rel: 0, what: $"χ²({1 - alpha}; {degreesOfFreedom})");
    }

    // The same table's lower-tail critical values χ²(α; ν) for ν = 10 (from the NIST table, from memory).
    [Theory]
    [InlineData(0.10, 4.865)]
    [InlineData(0.05, 3.940)]
    [InlineData(0.025, 3.247)]
    [InlineData(0.01, 2.558)]
    [InlineData(0.001, 1.479)]
    public void LowerCriticalValuesMatchTheNistTable(double alpha, double table)
    {
        Tolerance.Close(table, ChiSquare.Quantile(alpha, 10), abs: 5e-4, rel: 0);
    }

    [NeedsPythonFact]
    public void QuantilesAndUpperTailsAgreeWithScipy()
    {
        int[] dfs = [1, 2, 3, 5, 7, 9, 10, 20, 49];
        double[] probabilities = [0.001, 0.025, 0.1, 0.5, 0.9, 0.975, 0.99, 0.999, 0.999999];
        double[] statistics = [0.01, 0.5, 3, 10, 19.023, 40, 80, 200];
        var reference = PythonReference.Run(
            """
            import json, sys
            from scipy.stats import chi2
            d = json.load(sys.stdin)
            print(json.dumps({
                'ppf': [[float(chi2.ppf(q, k)) for q in d['q']] for k in d['k']],
                'sf': [[float(chi2.sf(x, k)) for x in d['x']] for k in d['k']],
            }))
            """,
            new { k = dfs, q = probabilities, x = statistics });
        for (var a = 0; a < dfs.Length; a++)
        {
            var ppf = reference.GetProperty("ppf")[a];
            var sf = reference.GetProperty("sf")[a];
            for (var b = 0; b < probabilities.Length; b++)
            {
                Tolerance.Close(ppf[b].GetDouble(), ChiSquare.Quantile(probabilities[b], dfs[a]), abs: 1e-12, rel: 1e-9, what: $"ppf({probabilities[b]}; {dfs[a]})");
            }

            for (var b = 0; b < statistics.Length; b++)
            {
                // Relative agreement also deep in the tail (sf down to ~1e-40), which 1 − CDF would lose.
                Tolerance.Close(sf[b].GetDouble(), ChiSquare.UpperTail(statistics[b], dfs[a]), abs: 1e-300, rel: 1e-9, what: $"sf({statistics[b]}; {dfs[a]})");
            }
        }
    }

    [Fact]
    public void UpperTailIsOneAtZeroAndZeroFarOutNeverNaN()
    {
        Assert.Equal(1, ChiSquare.UpperTail(0, 4));
        Assert.Equal(0, ChiSquare.UpperTail(double.PositiveInfinity, 4));
        var far = ChiSquare.UpperTail(1e6, 4);
        Assert.False(double.IsNaN(far));
        Assert.InRange(far, 0, 1e-300);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    [InlineData(-0.5)]
    [InlineData(double.NaN)]
    public void QuantileOutsideTheOpenUnitIntervalIsRefused(double probability)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => ChiSquare.Quantile(probability, 3));
    }
}
