using MathNet.Numerics.LinearAlgebra;

namespace Partwise.Core.Screening;

/// <summary>
/// The principal axes of a baseline's clr-form scatter, for a biplot of the reference spread with screened samples
/// placed on it: parts as directions, the baseline's threshold as a reference ellipse, samples as scores.
/// </summary>
/// <remarks>
/// <para><b>Axes.</b> The eigen-decomposition S_clr = Σ_k λ_k v_k v_kᵀ of the scatter in clr form (J × J, rank p;
/// see <see cref="Baseline"/>), eigenvalues in decreasing order. This is the principal component analysis of the clr
/// of the log-ratio literature (Aitchison 1983, Biometrika 70:57-65; the compositional biplot: Aitchison &amp;
/// Greenacre 2002, Applied Statistics 51:375-392), here of the baseline's own (robust or classical) scatter rather
/// than of a table. Each v_k is a log-contrast (v_kᵀ1 = 0) in the span of the baseline's coordinates. Its sign is
/// fixed so that its entry of largest magnitude is positive (the first such entry on a tie), so that a refit draws
/// the same picture.</para>
/// <para><b>Scores.</b> A sample with clr vector c has principal coordinates s_k = (c − μ_clr)ᵀ v_k. Summed over all
/// p axes, Σ_k s_k² / λ_k is the sample's squared Mahalanobis distance d² (S_clr⁺ = A Σ⁻¹ Aᵀ), so the first two
/// terms are the part of d² that the plane shows.</para>
/// <para><b>Parts.</b> Part j sits at its standard coordinates (v_j1, v_j2): the inner product of a sample's scores
/// with them is the rank-2 approximation of the sample's centred clr value c_j − μ_clr,j (a form biplot).</para>
/// <para><b>Reference ellipse.</b> s₁²/λ₁ + s₂²/λ₂ = threshold, semi-axes √(threshold · λ_k): the orthogonal
/// projection onto the plane of the ellipsoid d² = threshold. A sample outside it has d² above the threshold; one
/// inside may still be beyond it along the other axes.</para>
/// <para>Total variance: trace S_clr = Σ_k λ_k, the total log-ratio variance of the baseline's scatter (Aitchison
/// 1986); an axis explains λ_k / trace.</para>
/// </remarks>
public sealed class BaselineBiplot
{
    private readonly Baseline _baseline;
    private readonly double[] _variances;
    private readonly double[][] _axes;

    private BaselineBiplot(Baseline baseline, double[] variances, double[][] axes, double totalVariance)
    {
        _baseline = baseline;
        _variances = variances;
        _axes = axes;
        TotalVariance = totalVariance;
    }

    /// <summary>The number of axes shown: min(2, p).</summary>
    public int Dimensions => Math.Min(2, _variances.Length);

    /// <summary>λ_1 ≥ … ≥ λ_p &gt; 0, the variances along all p principal axes.</summary>
    public IReadOnlyList<double> Variances => _variances;

    /// <summary>trace S_clr = Σ λ_k.</summary>
    public double TotalVariance { get; }

    /// <summary>λ_k / trace S_clr for the axes shown.</summary>
    public IReadOnlyList<double> Explained => [.. _variances.Take(Dimensions).Select(l => l / TotalVariance)];

    /// <summary>Per part (in the baseline's part order), its standard coordinates on the axes shown: v_jk.</summary>
    public IReadOnlyList<IReadOnlyList<double>> PartCoordinates =>
        [.. Enumerable.Range(0, _baseline.PartCount).Select(j => (IReadOnlyList<double>)[.. _axes.Take(Dimensions).Select(v => v[j])])];

    /// <summary>Every principal axis v_k (k = 1..p), each of length J: the full eigenvectors.</summary>
    public IReadOnlyList<IReadOnlyList<double>> Axes => _axes;

    /// <summary>The d² threshold of the baseline.</summary>
    public double Threshold => _baseline.Threshold;

    /// <summary>√(threshold · λ_k) for the axes shown: the semi-axes of the reference ellipse.</summary>
    public IReadOnlyList<double> EllipseSemiAxes => [.. _variances.Take(Dimensions).Select(l => Math.Sqrt(Threshold * l))];

    /// <summary>Decomposes the clr-form scatter of <paramref name="baseline"/>.</summary>
    /// <param name="baseline">Any baseline (p ≥ 1 coordinates).</param>
    public static BaselineBiplot Create(Baseline baseline)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        var j = baseline.PartCount;
        var p = baseline.Dimension;
        var scatter = baseline.ClrScatter;
        var s = Matrix<double>.Build.Dense(j, j, (r, c) => scatter[(r * j) + c]);
        var evd = s.Evd(Symmetricity.Symmetric);
        var order = Enumerable.Range(0, j).OrderByDescending(k => evd.EigenValues[k].Real).Take(p).ToArray();
        var variances = new double[p];
        var axes = new double[p][];
        for (var k = 0; k < p; k++)
        {
            // S_clr has rank p exactly (Σ is positive definite and G has full column rank), so the p largest
            // eigenvalues are positive; clamp only rounding.
            variances[k] = Math.Max(evd.EigenValues[order[k]].Real, 0);
            var v = evd.EigenVectors.Column(order[k]).ToArray();
            var largest = 0;
            for (var r = 1; r < j; r++)
            {
                if (Math.Abs(v[r]) > Math.Abs(v[largest]) * (1 + 1e-12))
                {
                    largest = r;
                }
            }

            if (v[largest] < 0)
            {
                for (var r = 0; r < j; r++)
                {
                    v[r] = -v[r];
                }
            }

            axes[k] = v;
        }

        var trace = 0.0;
        for (var r = 0; r < j; r++)
        {
            trace += scatter[(r * j) + r];
        }

        return new BaselineBiplot(baseline, variances, axes, trace);
    }

    /// <summary>Places one sample: its scores on every axis and the parts of d² they account for.</summary>
    /// <param name="values">J finite, positive values in the baseline's part order (zeros already replaced).</param>
    /// <exception cref="ArgumentException">The wrong length, or a value that is not finite and positive.</exception>
    public BiplotPlacement Place(ReadOnlySpan<double> values)
    {
        var j = _baseline.PartCount;
        if (values.Length != j)
        {
            throw new ArgumentException($"A sample of this baseline has {j} values, not {values.Length}.", nameof(values));
        }

        var logs = new double[j];
        var mean = 0.0;
        for (var r = 0; r < j; r++)
        {
            if (!(values[r] > 0) || !double.IsFinite(values[r]))
            {
                throw new ArgumentException("Every value must be finite and positive.", nameof(values));
            }

            logs[r] = Math.Log(values[r]);
            mean += logs[r];
        }

        mean /= j;
        var centre = _baseline.ClrLocation;
        var scores = new double[_axes.Length];
        var squared = 0.0;
        var plane = 0.0;
        for (var k = 0; k < _axes.Length; k++)
        {
            var v = _axes[k];
            var score = 0.0;
            for (var r = 0; r < j; r++)
            {
                score += (logs[r] - mean - centre[r]) * v[r];
            }

            scores[k] = score;
            var term = score * score / _variances[k];
            squared += term;
            if (k < Dimensions)
            {
                plane += term;
            }
        }

        return new BiplotPlacement(scores, plane, squared);
    }
}

/// <summary>Where a sample sits on a baseline's principal axes.</summary>
/// <param name="Scores">s_k = (c − μ_clr)ᵀ v_k on every axis k = 1..p (the first two are the biplot's).</param>
/// <param name="PlaneSquaredDistance">s₁²/λ₁ + s₂²/λ₂: the part of d² in the biplot's plane; above the threshold the sample lies outside the reference ellipse.</param>
/// <param name="SquaredDistance">Σ_k s_k²/λ_k over all p axes: the squared Mahalanobis distance d².</param>
public sealed record BiplotPlacement(IReadOnlyList<double> Scores, double PlaneSquaredDistance, double SquaredDistance);
