namespace Partwise.Core.Screening;

/// <summary>
/// A location and scatter estimate over n reference rows of p coordinates, with the rows it rests on.
/// </summary>
public sealed class ScatterEstimate
{
    private readonly double[] _location;
    private readonly double[] _covariance;
    private readonly bool[] _used;

    internal ScatterEstimate(ScatterMethod method, int dimension, double[] location, double[] covariance, bool[] used, RobustScatterDetails? robust)
    {
        Method = method;
        Dimension = dimension;
        _location = location;
        _covariance = covariance;
        _used = used;
        Robust = robust;
    }

    /// <summary>The estimator that produced this estimate.</summary>
    public ScatterMethod Method { get; }

    /// <summary>The number of coordinates p.</summary>
    public int Dimension { get; }

    /// <summary>The number of reference rows n.</summary>
    public int Count => _used.Length;

    /// <summary>The location μ (length p).</summary>
    public IReadOnlyList<double> Location => _location;

    /// <summary>The covariance Σ (p × p, row-major, symmetric positive definite).</summary>
    public IReadOnlyList<double> Covariance => _covariance;

    /// <summary>
    /// For each reference row, whether the final estimate uses it: all rows for the classical estimate, the rows
    /// with weight 1 in the reweighting step for the robust one.
    /// </summary>
    public IReadOnlyList<bool> Used => _used;

    /// <summary>The number of rows the final estimate uses.</summary>
    public int UsedCount => _used.Count(u => u);

    /// <summary>The raw minimum covariance determinant and its factors, for the robust estimate; null for the classical one.</summary>
    public RobustScatterDetails? Robust { get; }

    internal double[] LocationArray => _location;

    internal double[] CovarianceArray => _covariance;
}

/// <summary>
/// The intermediate pieces of a reweighted minimum covariance determinant estimate (Rousseeuw &amp; Van Driessen 1999),
/// kept so that the estimate can be checked and explained.
/// </summary>
/// <param name="SupportSize">h = ⌊(n + p + 1) / 2⌋, the size of the subset whose covariance determinant is minimised.</param>
/// <param name="RawSupport">The h row indices of the best subset found, ascending.</param>
/// <param name="RawLocation">T₀, the mean of the best subset.</param>
/// <param name="RawCovariance">c₀ S₀: the covariance of the best subset (divisor h) times the raw consistency factor.</param>
/// <param name="RawConsistencyFactor">c₀ = med d²ᵢ(T₀, S₀) / χ²_p(0.5).</param>
/// <param name="ReweightedConsistencyFactor">c₁ = 0.975 / F_χ²(p+2)(χ²_p(0.975)).</param>
/// <param name="RawLogDeterminant">ln det S₀ of the best subset (divisor h), the criterion FAST-MCD minimises.</param>
/// <param name="Seed">The seed of the random subsets.</param>
public sealed record RobustScatterDetails(
    int SupportSize,
    IReadOnlyList<int> RawSupport,
    IReadOnlyList<double> RawLocation,
    IReadOnlyList<double> RawCovariance,
    double RawConsistencyFactor,
    double ReweightedConsistencyFactor,
    double RawLogDeterminant,
    int Seed);
