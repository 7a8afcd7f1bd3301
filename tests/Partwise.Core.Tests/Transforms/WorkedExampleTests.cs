using Partwise.Core.Ratios;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;
using Partwise.Core.Transforms;

namespace Partwise.Core.Tests.Transforms;

/// <summary>
/// Small compositions whose coordinates follow by hand from the published definitions; each test names the
/// definition it works from. x = (1, 2, 4) is used throughout because its logs are 0, ln 2 and 2 ln 2.
/// </summary>
public class WorkedExampleTests
{
    private static readonly double Ln2 = Math.Log(2);

    private static CompositionTable OneTwoFour() => CompositionTable.FromRows(["a", "b", "c"], [[1, 2, 4]]);

    [Fact]
    public void ClosureRescalesToTheTotal()
    {
        // C(x) = κ x / Σ x (Aitchison 1986, §2.2): (1, 2, 7) closes to (0.1, 0.2, 0.7).
        var closed = Closure.Close(CompositionTable.FromRows(["a", "b", "c"], [[1, 2, 7]]));
        Tolerance.Close([0.1, 0.2, 0.7], closed.Values, 1e-15);
        var percent = Closure.Close(CompositionTable.FromRows(["a", "b", "c"], [[1, 2, 7]]), 100);
        Tolerance.Close([10, 20, 70], percent.Values, 1e-13);
    }

    [Fact]
    public void ClrOfOneTwoFourIsMinusLn2ZeroLn2()
    {
        // clr_j = ln x_j − mean(ln x) (Aitchison 1986): mean ln = ln 2.
        var clr = Clr.Forward(OneTwoFour());
        Tolerance.Close([-Ln2, 0, Ln2], clr.Values, 1e-15);
        Assert.Equal(["clr(a)", "clr(b)", "clr(c)"], clr.Columns);
    }

    [Fact]
    public void WeightedClrCentresOnTheWeightedMeanLog()
    {
        // clr_w,j = ln x_j − Σ w_k ln x_k (Greenacre & Lewi 2009): logs (0, 1, 2), w = (½, ¼, ¼), centre ¾.
        var table = CompositionTable.FromRows(["a", "b", "c"], [[1, Math.E, Math.E * Math.E]]);
        var clr = Clr.Forward(table, [0.5, 0.25, 0.25]);
        Tolerance.Close([-0.75, 0.25, 1.25], clr.Values, 1e-15);
    }

    [Fact]
    public void AlrOfOneTwoFourOnTheLastPart()
    {
        // alr_j = ln(x_j / x_D) (Aitchison 1986): ln(1/4) = −2 ln 2, ln(2/4) = −ln 2.
        var alr = Alr.Forward(OneTwoFour(), 2);
        Tolerance.Close([-2 * Ln2, -Ln2], alr.Values, 1e-15);
        Assert.Equal(["a/c", "b/c"], alr.Columns);
    }

    [Fact]
    public void PivotCoordinatesOfOneTwoFour()
    {
        // z_i = √((J−i)/(J−i+1)) ln(x_i / g(x_{i+1..J})) (Fišerová & Hron 2011):
        // z_1 = √(2/3) ln(1 / √8) = −1.5 √(2/3) ln 2; z_2 = √(1/2) ln(2/4) = −ln 2 / √2.
        var ilr = Ilr.Forward(OneTwoFour(), PivotBasis.Create(["a", "b", "c"]));
        Tolerance.Close([-1.5 * Math.Sqrt(2.0 / 3) * Ln2, -Ln2 / Math.Sqrt(2)], ilr.Values, 1e-15);
        Assert.Equal(["g(a)/g(b,c)", "g(b)/g(c)"], ilr.Columns);
    }

    [Fact]
    public void PartitionBalanceIsTheScaledLogOfGeometricMeans()
    {
        // Balance √(rs/(r+s)) ln(g(+)/g(−)) (Egozcue & Pawlowsky-Glahn 2005). For (+,+,−,−) on x = (1, 2, 4, 8):
        // r = s = 2, so 1 · ln(√2 / √32) = −2 ln 2. The second row (+,−,0,0) gives √½ ln(1/2); the third √½ ln(4/8).
        var table = CompositionTable.FromRows(["a", "b", "c", "d"], [[1, 2, 4, 8]]);
        var basis = SequentialBinaryPartition.ToBasis(table.Parts, [[1, 1, -1, -1], [1, -1, 0, 0], [0, 0, 1, -1]]);
        var ilr = Ilr.Forward(table, basis);
        Tolerance.Close([-2 * Ln2, -Ln2 / Math.Sqrt(2), -Ln2 / Math.Sqrt(2)], ilr.Values, 1e-14);
        Assert.Equal("g(a,b)/g(c,d)", ilr.Columns[0]);
    }

    [Fact]
    public void PairwiseLogRatiosInCandidateOrder()
    {
        // ln(x_a/x_b) for a < b, ordered by first index then second (Greenacre 2019's candidate set).
        var pairs = PairwiseLogRatios.Forward(OneTwoFour());
        Assert.Equal(["a/b", "a/c", "b/c"], pairs.Columns);
        Tolerance.Close([-Ln2, -2 * Ln2, -Ln2], pairs.Values, 1e-15);
    }

    [Fact]
    public void RatioSetEvaluatesPairwiseAmalgamationAndBalance()
    {
        // Amalgamation ln(Σ_A / Σ_B) (Aitchison 1986, ch. 5): ln((1+2)/(4+8)) = ln(1/4).
        // Balance √(rs/(r+s)) ln(g(A)/g(B)) (Egozcue & Pawlowsky-Glahn 2005): ln(√2/√32) = −2 ln 2.
        var table = CompositionTable.FromRows(["Ca", "Mg", "Na", "K"], [[1, 2, 4, 8]]);
        var ratios = new[]
        {
            LogRatio.Create(table.Parts, ["Na"], ["K"], null, "/ratios/0"),
            LogRatio.Create(table.Parts, ["Ca", "Mg"], ["Na", "K"], RatioKind.Amalgamation, "/ratios/1"),
            LogRatio.Create(table.Parts, ["Ca", "Mg"], ["Na", "K"], RatioKind.Balance, "/ratios/2"),
        };
        var result = RatioSetTransform.Forward(table, ratios);
        Assert.Equal(["Na/K", "(Ca+Mg)/(Na+K)", "g(Ca,Mg)/g(Na,K)"], result.Columns);
        Tolerance.Close([-Ln2, Math.Log(0.25), -2 * Ln2], result.Values, 1e-15);
    }

    [Fact]
    public void InversesRecoverTheClosedComposition()
    {
        // C(exp(clr)), C([exp(alr), 1]) and C(exp(V z)) all give back (1, 2, 4) / 7 (Aitchison 1986; Egozcue et al. 2003).
        var table = OneTwoFour();
        double[] expected = [1 / 7.0, 2 / 7.0, 4 / 7.0];
        Tolerance.Close(expected, Clr.Inverse(table.Parts, Clr.Forward(table).Values).Values, 1e-15);
        Tolerance.Close(expected, Alr.Inverse(table.Parts, 2, Alr.Forward(table, 2).Values).Values, 1e-15);
        var basis = PivotBasis.Create(table.Parts);
        Tolerance.Close(expected, Ilr.Inverse(basis, Ilr.Forward(table, basis).Values).Values, 1e-15);
    }

    [Fact]
    public void InverseOfHugeCoordinatesDoesNotOverflow()
    {
        // exp(800) overflows a double; the closure of exp(y − max y) is the same composition.
        var result = Clr.Inverse(["a", "b"], [800, 0]);
        Tolerance.Close([1, Math.Exp(-800)], result.Values, 1e-300);
    }

    [Fact]
    public void ClosureOfValuesNearTheLargestDoubleDoesNotOverflow()
    {
        // Σ x overflows for three values of 1e308; the closure is still (⅓, ⅓, ⅓) × κ.
        var closed = Closure.Close(CompositionTable.FromRows(["a", "b", "c"], [[1e308, 1e308, 1e308]]), 1e308);
        Tolerance.Close([1e308 / 3, 1e308 / 3, 1e308 / 3], closed.Values, 0, 1e-15);
    }
}
