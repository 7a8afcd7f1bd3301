using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearAlgebra;
using Partwise.Core.Problems;

namespace Partwise.Core.Screening;

/// <summary>
/// A screening baseline: the location and scatter of reference samples in full-rank or partial log-ratio
/// coordinates y = (ln x) A, the chi-square threshold for their squared Mahalanobis distances, and everything a
/// screening needs to explain a distance in pairwise ratios. Immutable, so one instance serves concurrent screenings.
/// </summary>
/// <remarks>
/// <para><b>Coordinates.</b> A is J × p with columns that are log-contrasts (each sums to 0, so y does not depend on
/// the units or the closure of x) and with rank p ≤ J − 1. ilr with basis V (A = V), alr (A = [I; −1ᵀ]) and any
/// set of pairwise or balance ratios (one column per ratio, its log-contrast) all have this form. The squared
/// Mahalanobis distance is the same in any coordinates of the same span, since a change of basis y ↦ yM (M p × p
/// invertible) maps μ ↦ μM and Σ ↦ MᵀΣM (Filzmoser &amp; Hron 2008, Math. Geosci. 40:233-248).</para>
/// <para><b>clr form.</b> With c = clr(x) = ln x − mean(ln x)·1 and Aᵀ1 = 0, y = c A. Let G = A (AᵀA)⁻¹ (J × p,
/// the transposed Moore-Penrose pseudo-inverse of A) and P = G Aᵀ = A (AᵀA)⁻¹ Aᵀ, the orthogonal projector onto
/// the column space of A. Then G y = P c. For full-rank coordinates (p = J − 1) the column space of A is 1⊥, which
/// holds every clr vector, so c = G y exactly; the reference clr vectors therefore have location μ_clr = G μ and
/// scatter S_clr = G Σ Gᵀ (J × J, rank p). For ilr G = V, giving the familiar V μ and V Σ Vᵀ. For p &lt; J − 1 the
/// same G gives the location and scatter of P c, the part of clr(x) that the coordinates see.</para>
/// <para><b>Reasons.</b> Any log-contrast a (aᵀ1 = 0) in the column space of A has aᵀ ln x = aᵀ P c, mean aᵀμ_clr and
/// variance aᵀ S_clr a. For the pairwise ratio ln(x_i / x_j), a = e_i − e_j, so every pairwise z-score costs O(1)
/// after one O(J) pass: O(J²) for all of them. Pairwise ratios outside the column space (possible only when
/// p &lt; J − 1) are not used as reasons: the baseline says nothing about them and they do not enter the distance.
/// Named ratios (amalgamations) keep their own location and scale (<see cref="RatioBaseline"/>).</para>
/// <para>Pointers in problems are relative to a baseline document: <c>/parts</c>, <c>/location</c>,
/// <c>/covariance</c>, <c>/cutoff</c>, <c>/ratios</c>, <c>/namedRatios/k</c>, <c>/rules/k</c>.</para>
/// </remarks>
public sealed class Baseline
{
    /// <summary>The cutoff quantile used when none is given: 0.975.</summary>
    public const double DefaultCutoff = 0.975;

    /// <summary>
    /// z₀.₉₇₅ = Φ⁻¹(0.975) ≈ 1.959964, the multiple of the standard deviation that bounds the central 95% range of a
    /// reason's expected values (the "1.96" of the contract).
    /// </summary>
    public static readonly double ExpectedRangeZ = Normal.InvCDF(0, 1, 0.975);

    private readonly string[] _parts;
    private readonly double[] _map;
    private readonly double[] _location;
    private readonly double[] _covariance;
    private readonly double[] _factor;
    private readonly double[] _precision;
    private readonly double[] _clrLocation;
    private readonly double[] _clrScatter;
    private readonly RatioBaseline[] _namedRatios;
    private readonly RatioRule[] _rules;

    private Baseline(
        string[] parts,
        int dimension,
        double[] map,
        double[] location,
        double[] covariance,
        double[] factor,
        double[] precision,
        ScatterMethod scatter,
        double cutoff,
        double[] clrLocation,
        double[] clrScatter,
        RatioBaseline[] namedRatios,
        RatioRule[] rules)
    {
        _parts = parts;
        Dimension = dimension;
        _map = map;
        _location = location;
        _covariance = covariance;
        _factor = factor;
        _precision = precision;
        Scatter = scatter;
        Cutoff = cutoff;
        Threshold = ChiSquare.Quantile(cutoff, dimension);
        _clrLocation = clrLocation;
        _clrScatter = clrScatter;
        _namedRatios = namedRatios;
        _rules = rules;
        Pairs = PairTable.Create(parts, map, dimension, clrLocation, clrScatter);
    }

    /// <summary>The part names, in the order of <see cref="CoordinateMap"/>'s rows.</summary>
    public IReadOnlyList<string> Parts => _parts;

    /// <summary>The number of parts J.</summary>
    public int PartCount => _parts.Length;

    /// <summary>The number of coordinates p (1 ≤ p ≤ J − 1).</summary>
    public int Dimension { get; }

    /// <summary>The degrees of freedom of the chi-square reference distribution: p.</summary>
    public int DegreesOfFreedom => Dimension;

    /// <summary>A (J × p, row-major): coordinates y = (ln x) A.</summary>
    public IReadOnlyList<double> CoordinateMap => _map;

    /// <summary>The location μ of the reference coordinates (length p).</summary>
    public IReadOnlyList<double> Location => _location;

    /// <summary>The scatter Σ of the reference coordinates (p × p, row-major, symmetric positive definite).</summary>
    public IReadOnlyList<double> Covariance => _covariance;

    /// <summary>L, lower triangular with Σ = L Lᵀ (p × p, row-major).</summary>
    public IReadOnlyList<double> CholeskyFactor => _factor;

    /// <summary>Σ⁻¹ (p × p, row-major).</summary>
    public IReadOnlyList<double> Precision => _precision;

    /// <summary>How the location and scatter were estimated.</summary>
    public ScatterMethod Scatter { get; }

    /// <summary>The cutoff quantile in (0, 1).</summary>
    public double Cutoff { get; }

    /// <summary>The d² threshold χ²_p(cutoff); a sample with d² above it is flagged.</summary>
    public double Threshold { get; }

    /// <summary>μ_clr = G μ (length J), the location in clr form (see remarks).</summary>
    public IReadOnlyList<double> ClrLocation => _clrLocation;

    /// <summary>S_clr = G Σ Gᵀ (J × J, row-major), the scatter in clr form (see remarks).</summary>
    public IReadOnlyList<double> ClrScatter => _clrScatter;

    /// <summary>Named ratios with their own reference location and scale, used as reasons beside the pairwise ratios.</summary>
    public IReadOnlyList<RatioBaseline> NamedRatios => _namedRatios;

    /// <summary>Rules on ratio values.</summary>
    public IReadOnlyList<RatioRule> Rules => _rules;

    internal double[] MapArray => _map;

    internal double[] LocationArray => _location;

    internal double[] FactorArray => _factor;

    internal double[] ClrLocationArray => _clrLocation;

    internal RatioBaseline[] NamedRatioArray => _namedRatios;

    internal RatioRule[] RuleArray => _rules;

    internal PairTable Pairs { get; }

    /// <summary>
    /// Builds a baseline from its location and scatter, as a fit produces them or as a stored baseline document
    /// carries them; derives the Cholesky factor, Σ⁻¹, the threshold and the clr form.
    /// </summary>
    /// <param name="parts">J ≥ 2 unique, non-empty part names.</param>
    /// <param name="coordinateMap">A, J × p row-major, finite, each column summing to 0 (a log-contrast), rank p ≤ J − 1.</param>
    /// <param name="location">μ, length p, finite.</param>
    /// <param name="covariance">Σ, p × p row-major, symmetric (to 1e-9 relative; it is then symmetrised) and positive definite.</param>
    /// <param name="scatter">The method that estimated μ and Σ (recorded, not used in the arithmetic).</param>
    /// <param name="cutoff">The quantile in (0, 1) of χ²_p that becomes the threshold; default 0.975.</param>
    /// <param name="namedRatios">Named ratios with their reference location and scale (&gt; 0); their parts index <paramref name="parts"/>.</param>
    /// <param name="rules">Rules on ratio values; their parts index <paramref name="parts"/>.</param>
    /// <exception cref="ArgumentException">A map of the wrong shape, with a non-finite entry or a column that is not a log-contrast; a ratio over another part list.</exception>
    /// <exception cref="CompositionException">
    /// Bad parts (<c>/parts/j</c>), location (<c>/location</c>), covariance (<c>/covariance</c>, singular:
    /// <see cref="ProblemTypes.SingularScatter"/>), cutoff (<c>/cutoff</c>, <see cref="ProblemTypes.InvalidOption"/>),
    /// dependent coordinates (<c>/ratios</c>, <see cref="ProblemTypes.SingularRatioSet"/>), named ratio scale or rule limits.
    /// </exception>
    public static Baseline Create(
        IReadOnlyList<string> parts,
        IReadOnlyList<double> coordinateMap,
        IReadOnlyList<double> location,
        IReadOnlyList<double> covariance,
        ScatterMethod scatter,
        double cutoff = DefaultCutoff,
        IReadOnlyList<RatioBaseline>? namedRatios = null,
        IReadOnlyList<RatioRule>? rules = null)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(coordinateMap);
        ArgumentNullException.ThrowIfNull(location);
        ArgumentNullException.ThrowIfNull(covariance);
        var partArray = ValidateParts(parts);
        var j = partArray.Length;
        ValidateCutoff(cutoff);
        var p = location.Count;
        if (p < 1 || p > j - 1)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/location", $"A baseline over {j} parts has between 1 and {j - 1} coordinates, not {p}.");
        }

        var map = ValidateMap(coordinateMap, j, p);
        var mu = new double[p];
        for (var k = 0; k < p; k++)
        {
            mu[k] = double.IsFinite(location[k])
                ? location[k]
                : throw new CompositionException(ProblemTypes.NonFiniteValue, $"/location/{k}", "The location must be finite.");
        }

        var sigma = ValidateCovariance(covariance, p);
        var factor = new double[p * p];
        if (!CholeskyKernel.TryFactor(sigma, p, factor, out _))
        {
            throw new CompositionException(ProblemTypes.SingularScatter, "/covariance", "The covariance is not positive definite, so no distance can be computed.");
        }

        var a = Matrix<double>.Build.Dense(j, p, (r, c) => map[(r * p) + c]);
        var ata = a.TransposeThisAndMultiply(a);
        if (!CholeskyKernel.TryFactor(ata.ToRowMajorArray(), p, new double[p * p], out _))
        {
            throw new CompositionException(ProblemTypes.SingularRatioSet, "/ratios", "The coordinates are linearly dependent: a ratio is a combination of the others.");
        }

        // G = A (AᵀA)⁻¹; μ_clr = G μ; S_clr = G Σ Gᵀ (see remarks).
        var g = ata.Cholesky().Solve(a.Transpose()).Transpose();
        var sigmaMatrix = Matrix<double>.Build.Dense(p, p, (r, c) => sigma[(r * p) + c]);
        var clrLocation = (g * Vector<double>.Build.DenseOfArray(mu)).ToArray();
        var clrScatter = (g * sigmaMatrix).TransposeAndMultiply(g);
        clrScatter = (clrScatter + clrScatter.Transpose()) / 2;
        var precision = sigmaMatrix.Cholesky().Solve(Matrix<double>.Build.DenseIdentity(p));
        precision = (precision + precision.Transpose()) / 2;

        var named = ValidateNamedRatios(namedRatios ?? [], j);
        var ruleArray = ValidateRules(rules ?? [], j);
        return new Baseline(
            partArray,
            p,
            map,
            mu,
            sigma,
            factor,
            precision.ToRowMajorArray(),
            scatter,
            cutoff,
            clrLocation,
            clrScatter.ToRowMajorArray(),
            named,
            ruleArray);
    }

    /// <summary>Checks a cutoff quantile: finite and strictly inside (0, 1), else <see cref="ProblemTypes.InvalidOption"/> at <c>/cutoff</c>.</summary>
    internal static void ValidateCutoff(double cutoff)
    {
        if (!(cutoff > 0 && cutoff < 1))
        {
            throw new CompositionException(ProblemTypes.InvalidOption, "/cutoff", "The cutoff is a quantile and must lie strictly between 0 and 1.");
        }
    }

    private static string[] ValidateParts(IReadOnlyList<string> parts)
    {
        if (parts.Count < 2)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/parts", "A baseline needs at least two parts.");
        }

        var seen = new HashSet<string>(StringComparer.Ordinal);
        for (var j = 0; j < parts.Count; j++)
        {
            if (string.IsNullOrWhiteSpace(parts[j]))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, $"/parts/{j}", "A part name must not be empty.");
            }

            if (!seen.Add(parts[j]))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, $"/parts/{j}", $"The part name '{parts[j]}' appears more than once.");
            }
        }

        return [.. parts];
    }

    private static double[] ValidateMap(IReadOnlyList<double> coordinateMap, int j, int p)
    {
        if (coordinateMap.Count != j * p)
        {
            throw new ArgumentException($"The coordinate map must be {j} × {p} ({j * p} values), not {coordinateMap.Count} values.", nameof(coordinateMap));
        }

        var map = coordinateMap.ToArray();
        for (var c = 0; c < p; c++)
        {
            double sum = 0, size = 0;
            for (var r = 0; r < j; r++)
            {
                var v = map[(r * p) + c];
                if (!double.IsFinite(v))
                {
                    throw new ArgumentException("Every entry of the coordinate map must be finite.", nameof(coordinateMap));
                }

                sum += v;
                size += Math.Abs(v);
            }

            // A column that does not sum to zero would make the coordinate depend on the units of x.
            if (size == 0 || Math.Abs(sum) > 1e-9 * size)
            {
                throw new ArgumentException($"Column {c} of the coordinate map is not a log-contrast: its entries must sum to 0 and not all be 0.", nameof(coordinateMap));
            }
        }

        return map;
    }

    private static double[] ValidateCovariance(IReadOnlyList<double> covariance, int p)
    {
        if (covariance.Count != p * p)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/covariance", $"The covariance must be {p} × {p}.");
        }

        var s = covariance.ToArray();
        double largest = 0;
        for (var k = 0; k < s.Length; k++)
        {
            if (!double.IsFinite(s[k]))
            {
                throw new CompositionException(ProblemTypes.NonFiniteValue, $"/covariance/{k / p}/{k % p}", "The covariance must be finite.");
            }

            largest = Math.Max(largest, Math.Abs(s[k]));
        }

        for (var r = 0; r < p; r++)
        {
            for (var c = 0; c < r; c++)
            {
                if (Math.Abs(s[(r * p) + c] - s[(c * p) + r]) > 1e-9 * largest)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, $"/covariance/{r}/{c}", "The covariance must be symmetric.");
                }

                var mean = (s[(r * p) + c] + s[(c * p) + r]) / 2;
                s[(r * p) + c] = mean;
                s[(c * p) + r] = mean;
            }
        }

        return s;
    }

    private static RatioBaseline[] ValidateNamedRatios(IReadOnlyList<RatioBaseline> namedRatios, int j)
    {
        var result = namedRatios.ToArray();
        for (var k = 0; k < result.Length; k++)
        {
            var r = result[k] ?? throw new ArgumentException("A named ratio must not be null.", nameof(namedRatios));
            RequireParts(r.Ratio, j, nameof(namedRatios));
            if (!double.IsFinite(r.Location))
            {
                throw new CompositionException(ProblemTypes.NonFiniteValue, $"/namedRatios/{k}/location", "The location must be finite.");
            }

            if (!(r.Scale > 0) || !double.IsFinite(r.Scale))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, $"/namedRatios/{k}/scale", "The scale must be a positive, finite number.");
            }
        }

        return result;
    }

    private static RatioRule[] ValidateRules(IReadOnlyList<RatioRule> rules, int j)
    {
        var result = rules.ToArray();
        for (var k = 0; k < result.Length; k++)
        {
            var rule = result[k] ?? throw new ArgumentException("A rule must not be null.", nameof(rules));
            RequireParts(rule.Ratio, j, nameof(rules));
            if (rule.Min is null && rule.Max is null)
            {
                throw new CompositionException(ProblemTypes.InvalidOption, $"/rules/{k}", "A rule needs a min, a max or both.");
            }

            if (rule.Min is { } min && !double.IsFinite(min))
            {
                throw new CompositionException(ProblemTypes.InvalidOption, $"/rules/{k}/min", "The min must be a finite number.");
            }

            if (rule.Max is { } max && !double.IsFinite(max))
            {
                throw new CompositionException(ProblemTypes.InvalidOption, $"/rules/{k}/max", "The max must be a finite number.");
            }

            if (rule.Min > rule.Max)
            {
                throw new CompositionException(ProblemTypes.InvalidOption, $"/rules/{k}", "The min must not exceed the max.");
            }
        }

        return result;
    }

    private static void RequireParts(Ratios.LogRatio ratio, int j, string parameter)
    {
        ArgumentNullException.ThrowIfNull(ratio, parameter);
        if (ratio.Numerator.Concat(ratio.Denominator).Any(i => i < 0 || i >= j))
        {
            throw new ArgumentException($"The ratio '{ratio.Label}' refers to a part outside the baseline's {j} parts.", parameter);
        }
    }
}
