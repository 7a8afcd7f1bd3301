using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;
using Partwise.Core.Variance;

namespace Partwise.Core.Tests.Variance;

public class SummaryWorkedExampleTests
{
    // Rows (1, 1, 1) and (1, e, e²): logs (0, 0, 0) and (0, 1, 2).
    private static CompositionTable TwoRows() => CompositionTable.FromRows(["a", "b", "c"], [[1, 1, 1], [1, Math.E, Math.E * Math.E]]);

    [Fact]
    public void VariationMatrixTotalVarianceAndContributionsByHand()
    {
        // T_ab = var(ln(x_a/x_b)) with divisor n − 1 (Aitchison 1986, §4.4): ln(a/b) ∈ {0, −1} → ½;
        // ln(a/c) ∈ {0, −2} → 2; ln(b/c) ∈ {0, −1} → ½. TV = Σ_{a<b} w_a w_b T_ab = (½ + 2 + ½)/9 = ⅓
        // (Greenacre 2019). clr of row 2 is (−1, 0, 1), so var(clr) = (½, 0, ½) and contributions (½, 0, ½).
        var s = CompositionSummary.Compute(TwoRows());
        Tolerance.Close([0, 0.5, 2, 0.5, 0, 0.5, 2, 0.5, 0], s.VariationMatrix, 1e-14);
        Tolerance.Close(1.0 / 3, s.TotalVariance, 1e-15);
        Tolerance.Close([0.5, 0, 0.5], s.PartContributions, 1e-14);
        Assert.Equal("n-1", s.Divisor);
    }

    [Fact]
    public void CenterIsTheClosedGeometricMean()
    {
        // Geometric means per part: 1, e^½, e^1 (Aitchison 1986, §4.7), closed to 1.
        var s = CompositionSummary.Compute(TwoRows());
        var g = new[] { 1, Math.Exp(0.5), Math.E };
        Tolerance.Close(g.Select(v => v / g.Sum()).ToArray(), s.Center, 1e-15);
    }

    [Fact]
    public void AitchisonDistanceByHand()
    {
        // clr difference (−1, 0, 1) → ‖·‖ = √2 (Aitchison 1986).
        var d = AitchisonDistance.Matrix(TwoRows());
        Tolerance.Close([0, Math.Sqrt(2), Math.Sqrt(2), 0], d, 1e-15);
        Tolerance.Close(Math.Sqrt(2), AitchisonDistance.Between([1, 1, 1], [1, Math.E, Math.E * Math.E]), 1e-15);
    }
}
