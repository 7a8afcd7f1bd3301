namespace Partwise.Api.Tests.Support;

/// <summary>
/// A worked example small enough to compute by hand. Three parts a, b, c and two rows x₁ = (1, 2, 4) and
/// x₂ = (4, 2, 1), so that every log is a multiple of l = ln 2: ln x₁ = (0, l, 2l), ln x₂ = (2l, l, 0).
/// Each expected value below names its formula and source.
/// </summary>
public static class WorkedExample
{
    /// <summary>l = ln 2.</summary>
    public static readonly double L = Math.Log(2);

    /// <summary>The parts.</summary>
    public static readonly string[] Parts = ["a", "b", "c"];

    /// <summary>The table as the JSON fields of a request.</summary>
    public const string TableFields = "\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 4], [4, 2, 1]], \"ids\": [\"w1\", \"w2\"]";

    /// <summary>The table as CSV.</summary>
    public const string Csv = "id,a,b,c\nw1,1,2,4\nw2,4,2,1\n";

    /// <summary>A JSON request with the table and <paramref name="options"/> (members without braces).</summary>
    public static string Json(string options = "") => "{" + TableFields + (options.Length == 0 ? "" : ", " + options) + "}";

    /// <summary>C(x₁) = x₁ / 7 (Aitchison 1986, closure).</summary>
    public static readonly double[] Closed1 = [1 / 7.0, 2 / 7.0, 4 / 7.0];

    /// <summary>clr(x₁) = ln x₁ − mean(ln x₁) = (0, l, 2l) − l = (−l, 0, l) (Aitchison 1986).</summary>
    public static double[] Clr1 => [-L, 0, L];

    /// <summary>alr(x₁) with denominator c = (ln(1/4), ln(2/4)) = (−2l, −l) (Aitchison 1986).</summary>
    public static double[] Alr1 => [-2 * L, -L];

    /// <summary>
    /// Pivot coordinates (Fišerová &amp; Hron 2011): z₁ = √(2/3) ln(x_a / √(x_b x_c)) = √(2/3)(0 − 1.5 l),
    /// z₂ = √(1/2) ln(x_b / x_c) = −l / √2.
    /// </summary>
    public static double[] Pivot1 => [-Math.Sqrt(2.0 / 3) * 1.5 * L, -L / Math.Sqrt(2)];

    /// <summary>Pairwise log-ratios a/b, a/c, b/c of x₁: (−l, −2l, −l).</summary>
    public static double[] Pairwise1 => [-L, -2 * L, -L];
}
