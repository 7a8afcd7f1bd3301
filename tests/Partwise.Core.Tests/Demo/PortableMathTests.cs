using Partwise.Core.Tests.Support;
using Partwise.Demo;

namespace Partwise.Core.Tests.Demo;

public class PortableMathTests
{
    // Reference: the runtime's Math.Exp, Math.Log and Math.Cos (the platform C library), which the portable
    // series replace only to make the demo files platform independent.
    [Fact]
    public void PortableExpLogAndCosAgreeWithTheRuntimeToNearMachinePrecision()
    {
        var random = new Random(5);
        for (var i = 0; i < 20000; i++)
        {
            var x = (random.NextDouble() * 40) - 20;
            Tolerance.Close(Math.Exp(x), PortableMath.Exp(x), abs: 0, rel: 4e-15, what: $"exp({x:R})");
            var y = Math.Exp((random.NextDouble() * 60) - 30);
            Tolerance.Close(Math.Log(y), PortableMath.Log(y), abs: 1e-15, rel: 4e-15, what: $"ln({y:R})");
            var u = random.NextDouble();
            Tolerance.Close(Math.Cos(2 * Math.PI * u), PortableMath.CosTurns(u), abs: 2e-15, rel: 0, what: $"cos(2π·{u:R})");
        }
    }

    [Fact]
    public void BoxMullerDrawsHaveMeanZeroAndVarianceOne()
    {
        // Standard normal moments; with 200,000 draws the standard errors are 0.0022 (mean) and 0.0032 (variance).
        var normal = new SeededNormal(11);
        const int n = 200_000;
        double sum = 0, sumSq = 0, beyond196 = 0;
        for (var i = 0; i < n; i++)
        {
            var z = normal.Next();
            sum += z;
            sumSq += z * z;
            beyond196 += Math.Abs(z) > 1.959964 ? 1 : 0;
        }

        var mean = sum / n;
        Assert.InRange(mean, -0.01, 0.01);
        Assert.InRange((sumSq / n) - (mean * mean), 0.985, 1.015);
        Assert.InRange(beyond196 / n, 0.047, 0.053); // P(|Z| > 1.96) = 0.05
    }
}
