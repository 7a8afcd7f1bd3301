namespace Partwise.Core.Zeros;

/// <summary>What to do with zero cells before taking logs. Log-ratios of a zero are undefined.</summary>
public abstract record ZeroPolicy
{
    /// <summary>Refuse any zero: the caller must resolve it (the default).</summary>
    public static ZeroPolicy Reject { get; } = new RejectZeros();
}

/// <summary>Refuse every zero cell with a problem naming its pointer.</summary>
public sealed record RejectZeros : ZeroPolicy;

/// <summary>
/// Multiplicative replacement of zeros below detection limits (Martín-Fernández, Barceló-Vidal &amp;
/// Pawlowsky-Glahn 2003, Math. Geol. 35:253-278).
/// </summary>
/// <param name="LimitForAll">One detection limit for every part, in the table's units; or null.</param>
/// <param name="LimitsByPart">Detection limits per part name, in the table's units; or null. Wins over <paramref name="LimitForAll"/>.</param>
/// <param name="Fraction">f in δ = f · DL, in (0, 1]; 0.65 is common practice.</param>
public sealed record MultiplicativeReplacement(
    double? LimitForAll,
    IReadOnlyDictionary<string, double>? LimitsByPart,
    double Fraction = MultiplicativeReplacement.DefaultFraction) : ZeroPolicy
{
    /// <summary>The fraction of the detection limit used when none is given (common practice).</summary>
    public const double DefaultFraction = 0.65;
}

/// <summary>
/// Bayesian-multiplicative replacement of count zeros (Martín-Fernández, Hron, Templ, Filzmoser &amp;
/// Palarea-Albaladejo 2015, Statistical Modelling 15:134-158).
/// </summary>
/// <param name="Prior">The Dirichlet prior's strength.</param>
public sealed record BayesianMultiplicativeReplacement(CountPrior Prior) : ZeroPolicy;

/// <summary>Dirichlet priors with expectation t_j = 1/J and strength s (Martín-Fernández et al. 2015, Table 1).</summary>
public enum CountPrior
{
    /// <summary>s = J (Bayes–Laplace, uniform prior).</summary>
    BayesLaplace,

    /// <summary>s = J/2 (Jeffreys).</summary>
    Jeffreys,

    /// <summary>s = 1 (Perks).</summary>
    Perks,

    /// <summary>s = √N with N the row total (square root).</summary>
    SquareRoot,
}
