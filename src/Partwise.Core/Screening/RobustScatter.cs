namespace Partwise.Core.Screening;

/// <summary>
/// The reweighted minimum covariance determinant (MCD) location and scatter, found by FAST-MCD
/// (Rousseeuw &amp; Van Driessen 1999, Technometrics 41:212-223). Robust distances in log-ratio coordinates are the
/// published way to find outlying compositions (Filzmoser &amp; Hron 2008, Math. Geosci. 40:233-248).
/// </summary>
/// <remarks>
/// <para>Raw MCD: the h = ⌊(n + p + 1) / 2⌋ rows whose covariance has the smallest determinant (searched as in
/// <c>FastMcd</c>; for p = 1 exactly, as the contiguous h sorted values of least variance, Rousseeuw &amp; Leroy 1987,
/// Robust Regression and Outlier Detection, ch. 4). T₀ is their mean and S₀ their covariance (divisor h).</para>
/// <para>Consistency of the raw scatter (Rousseeuw &amp; Van Driessen 1999): S₀ is multiplied by
/// c₀ = med d²ᵢ(T₀, S₀) / χ²_p(0.5), so that at the normal model the median distance matches the median of χ²_p.</para>
/// <para>One reweighting step (ibid.): weight wᵢ = 1 when d²ᵢ(T₀, c₀S₀) ≤ χ²_p(0.975), else 0;
/// T₁ = Σ wᵢ yᵢ / Σ wᵢ and S₁ = Σ wᵢ (yᵢ − T₁)(yᵢ − T₁)ᵀ / (Σ wᵢ − 1).</para>
/// <para>Consistency of the reweighted scatter: S₁ is multiplied by c₁ = 0.975 / F_χ²(p+2)(χ²_p(0.975)). At the
/// normal model the rows kept are those inside the 0.975 ellipsoid, whose covariance is Σ·F_χ²(p+2)(q)/F_χ²(p)(q)
/// with q = χ²_p(0.975) (because E[R² 1{R² ≤ q}] = p F_χ²(p+2)(q) for R² ~ χ²_p); c₁ undoes that shrinkage
/// (the asymptotic factor of Croux &amp; Haesbroeck 1999, J. Multivariate Anal. 71:161-190). No small-sample
/// correction is applied.</para>
/// <para>The random subsets come from <see cref="Random"/> seeded with <c>seed</c>: the same data and seed give the
/// same estimate, bit for bit, on every run.</para>
/// </remarks>
public static class RobustScatter
{
    /// <summary>The seed used unless the caller gives one (an arbitrary constant, fixed so refits agree).</summary>
    public const int DefaultSeed = 19990212;

    /// <summary>The chi-square quantile of the reweighting step, 0.975 (Rousseeuw &amp; Van Driessen 1999).</summary>
    public const double ReweightingQuantile = 0.975;

    /// <summary>
    /// The reweighted MCD estimate of the rows of a row-major n × p coordinate matrix.
    /// </summary>
    /// <param name="coordinates">n × p finite values, row-major (not modified); n ≥ p + 1.</param>
    /// <param name="dimension">p ≥ 1.</param>
    /// <param name="seed">Seed of the random subsets; any integer.</param>
    /// <param name="pointer">JSON pointer of the reference rows in the request, for problems.</param>
    /// <param name="cancellationToken">Looked at once per FAST-MCD trial and C-step; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>T₁ and c₁S₁, the rows with weight 1, and the raw estimate in <see cref="ScatterEstimate.Robust"/>.</returns>
    /// <exception cref="ArgumentException">A shape that is not n × p or a non-finite value.</exception>
    /// <exception cref="Problems.CompositionException">
    /// <see cref="Problems.ProblemTypes.TooFewSamples"/> when n &lt; p + 1; <see cref="Problems.ProblemTypes.SingularScatter"/>
    /// when the coordinates' covariance is singular, or h or more rows lie on a hyperplane (exact fit), so that
    /// the raw or reweighted scatter is singular.
    /// </exception>
    public static ScatterEstimate Fit(double[] coordinates, int dimension, int seed = DefaultSeed, string pointer = "/rows", CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(coordinates);

        // The classical fit checks shape, count and overall singularity with the clearest messages.
        var classical = ClassicalScatter.Fit(coordinates, dimension, pointer);
        var n = classical.Count;
        var p = dimension;
        var h = (n + p + 1) / 2;

        var support = p == 1 ? UnivariateSupport(coordinates, h) : new FastMcd(coordinates, p, h, seed, pointer, cancellationToken).Search();
        Array.Sort(support);

        var work = new double[2 * p];
        var rawLocation = new double[p];
        var rawCovariance = new double[p * p];
        var factor = new double[p * p];
        SubsetMoments.Compute(coordinates, p, support, h, rawLocation, rawCovariance, work);
        if (!CholeskyKernel.TryFactor(rawCovariance, p, factor, out var rawLogDet))
        {
            throw ScatterInput.Singular(pointer, $"At least {h} of the {n} reference samples lie on a hyperplane of the coordinate space, so their minimum covariance determinant is singular.");
        }

        var d2 = new double[n];
        for (var i = 0; i < n; i++)
        {
            d2[i] = CholeskyKernel.SquaredDistance(coordinates.AsSpan(i * p, p), rawLocation, factor, p, work);
        }

        var c0 = RatioValues.Median(d2) / ChiSquare.Quantile(0.5, p);
        if (!(c0 > 0) || !double.IsFinite(c0))
        {
            throw ScatterInput.Singular(pointer, "More than half of the reference samples coincide in coordinate space, so no robust scatter can be scaled.");
        }

        for (var k = 0; k < rawCovariance.Length; k++)
        {
            rawCovariance[k] *= c0;
        }

        var q = ChiSquare.Quantile(ReweightingQuantile, p);
        var used = new bool[n];
        var kept = new List<int>(n);
        for (var i = 0; i < n; i++)
        {
            if (d2[i] / c0 <= q)
            {
                used[i] = true;
                kept.Add(i);
            }
        }

        if (kept.Count < p + 1)
        {
            throw ScatterInput.Singular(pointer, "Too few reference samples lie inside the robust 0.975 ellipsoid to estimate a scatter.");
        }

        var location = new double[p];
        var covariance = new double[p * p];
        SubsetMoments.Compute(coordinates, p, kept.ToArray(), kept.Count - 1, location, covariance, work);
        var c1 = ReweightedConsistencyFactor(p);
        for (var k = 0; k < covariance.Length; k++)
        {
            covariance[k] *= c1;
        }

        if (!CholeskyKernel.TryFactor(covariance, p, factor, out _))
        {
            throw ScatterInput.Singular(pointer, "The covariance of the reweighted reference samples is singular.");
        }

        var details = new RobustScatterDetails(h, support, rawLocation, rawCovariance, c0, c1, rawLogDet, seed);
        return new ScatterEstimate(ScatterMethod.Robust, p, location, covariance, used, details);
    }

    /// <summary>
    /// c₁ = 0.975 / F_χ²(p+2)(χ²_p(0.975)), the factor that makes the reweighted scatter consistent at the normal
    /// model (see the remarks of <see cref="RobustScatter"/>). About 1.16 for p = 1 and 1.04 for p = 9.
    /// </summary>
    /// <param name="dimension">p ≥ 1.</param>
    public static double ReweightedConsistencyFactor(int dimension) =>
        ReweightingQuantile / ChiSquare.Cdf(ChiSquare.Quantile(ReweightingQuantile, dimension), dimension + 2);

    // p = 1: the MCD subset is a run of h consecutive order statistics; take the run of least variance.
    private static int[] UnivariateSupport(double[] values, int h)
    {
        var n = values.Length;
        var order = Enumerable.Range(0, n).ToArray();
        var sorted = (double[])values.Clone();
        Array.Sort(sorted, order);
        var shift = sorted[n / 2];
        var s1 = new double[n + 1];
        var s2 = new double[n + 1];
        for (var i = 0; i < n; i++)
        {
            var v = sorted[i] - shift;
            s1[i + 1] = s1[i] + v;
            s2[i + 1] = s2[i] + (v * v);
        }

        var bestStart = 0;
        var bestSpread = double.PositiveInfinity;
        for (var start = 0; start + h <= n; start++)
        {
            var sum = s1[start + h] - s1[start];
            var spread = s2[start + h] - s2[start] - (sum * sum / h);
            if (spread < bestSpread)
            {
                bestSpread = spread;
                bestStart = start;
            }
        }

        return order[bestStart..(bestStart + h)];
    }
}
