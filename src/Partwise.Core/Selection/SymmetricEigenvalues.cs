namespace Partwise.Core.Selection;

/// <summary>
/// Eigenvalues (no vectors) of a small dense symmetric matrix: Householder reduction to tridiagonal form, then the
/// implicit symmetric QR iteration with the Wilkinson shift (Golub &amp; Van Loan 2013, Matrix Computations, 4th ed.,
/// algorithms 8.3.1 and 8.3.2).
/// </summary>
/// <remarks>
/// The stepwise selection needs the eigenvalues of a k × k matrix after every step (for the Procrustes correlation);
/// skipping the eigenvectors keeps that at about 4/3 k³ flops, several times less than a full decomposition.
/// </remarks>
internal static class SymmetricEigenvalues
{
    private const double MachineEpsilon = 2.220446049250313e-16;

    /// <summary>
    /// Overwrites the k × k row-major symmetric matrix in <paramref name="a"/> (both triangles are read) and
    /// writes its k eigenvalues, in no particular order, to <paramref name="eigenvalues"/>.
    /// </summary>
    /// <param name="a">At least k² values; destroyed.</param>
    /// <param name="k">The order, k ≥ 1.</param>
    /// <param name="eigenvalues">At least k values (the diagonal of the tridiagonal form, then the eigenvalues).</param>
    /// <param name="work">At least 3k values of scratch.</param>
    public static void Compute(Span<double> a, int k, Span<double> eigenvalues, Span<double> work)
    {
        if (k < 1 || a.Length < k * k || eigenvalues.Length < k || work.Length < 3 * k)
        {
            throw new ArgumentException("The buffers are too small for a matrix of this order.");
        }

        var d = eigenvalues[..k];
        var e = work[..k];
        var v = work.Slice(k, k);
        var p = work.Slice(2 * k, k);
        Tridiagonalize(a, k, d, e, v, p);
        TridiagonalQr(d, e, k);
    }

    private static void Tridiagonalize(Span<double> a, int k, Span<double> d, Span<double> e, Span<double> v, Span<double> p)
    {
        for (var c = 0; c < k - 2; c++)
        {
            // Householder vector for x = A[c+1.., c]: H x = alpha e1 with alpha = -sign(x0) ||x||.
            var len = k - c - 1;
            var norm2 = 0.0;
            for (var i = 0; i < len; i++)
            {
                var x = a[((c + 1 + i) * k) + c];
                v[i] = x;
                norm2 += x * x;
            }

            d[c] = a[(c * k) + c];
            if (norm2 == 0)
            {
                e[c] = 0;
                continue;
            }

            var norm = Math.Sqrt(norm2);
            var alpha = v[0] >= 0 ? -norm : norm;
            v[0] -= alpha;
            var vv = norm2 - (2 * alpha * (v[0] + alpha)) + (alpha * alpha);
            e[c] = alpha;
            if (vv == 0)
            {
                continue;
            }

            var beta = 2.0 / vv;

            // p = beta A22 v (row dot products over the full symmetric block), then w = p - (beta p'v / 2) v and
            // A22 -= v w' + w v', on both triangles so that every loop runs over a contiguous row.
            var off = c + 1;
            var vs = v[..len];
            var ps = p[..len];
            for (var i = 0; i < len; i++)
            {
                ps[i] = beta * DenseKernels.Dot(a.Slice(((off + i) * k) + off, len), vs);
            }

            var half = beta * DenseKernels.Dot(ps, vs) / 2;
            DenseKernels.AddScaled(ps, -half, vs);
            for (var i = 0; i < len; i++)
            {
                DenseKernels.AddScaled2(a.Slice(((off + i) * k) + off, len), -vs[i], ps, -ps[i], vs);
            }
        }

        if (k >= 2)
        {
            d[k - 2] = a[((k - 2) * k) + k - 2];
            e[k - 2] = a[((k - 1) * k) + k - 2];
        }

        d[k - 1] = a[((k - 1) * k) + k - 1];
        e[k - 1] = 0;
    }

    private static void TridiagonalQr(Span<double> d, Span<double> e, int k)
    {
        var scale = 0.0;
        for (var i = 0; i < k; i++)
        {
            scale = Math.Max(scale, Math.Abs(d[i]) + Math.Abs(e[i]));
        }

        // Off-diagonals below this are treated as zero (relative to their diagonal neighbours, or to the whole
        // matrix for eigenvalues near zero): the eigenvalues then move by less than that.
        var floor = scale * 1e-19;
        var h = k - 1;
        var iterations = 0;
        while (h > 0)
        {
            for (var i = 0; i < h; i++)
            {
                if (Math.Abs(e[i]) <= MachineEpsilon * (Math.Abs(d[i]) + Math.Abs(d[i + 1])) || Math.Abs(e[i]) <= floor)
                {
                    e[i] = 0;
                }
            }

            while (h > 0 && e[h - 1] == 0)
            {
                h--;
            }

            if (h == 0)
            {
                break;
            }

            var l = h - 1;
            while (l > 0 && e[l - 1] != 0)
            {
                l--;
            }

            if (++iterations > 60 * k)
            {
                throw new InvalidOperationException("The symmetric QR iteration did not converge.");
            }

            WilkinsonStep(d, e, l, h);
        }
    }

    // One implicit symmetric QR step with the Wilkinson shift on the unreduced block l..h (Golub & Van Loan, alg. 8.3.2).
    private static void WilkinsonStep(Span<double> d, Span<double> e, int l, int h)
    {
        var t = (d[h - 1] - d[h]) / 2;
        var eh = e[h - 1];
        var root = Math.Sqrt((t * t) + (eh * eh));
        var mu = d[h] - (eh * eh / (t + (t >= 0 ? root : -root)));
        var x = d[l] - mu;
        var z = e[l];
        var bulge = 0.0;
        for (var m = l; m < h; m++)
        {
            // Givens rotation with c x - s z = r and s x + c z = 0.
            double c, s;
            if (z == 0)
            {
                c = 1;
                s = 0;
            }
            else
            {
                var r = Math.Sqrt((x * x) + (z * z));
                c = x / r;
                s = -z / r;
            }

            if (m > l)
            {
                e[m - 1] = (c * e[m - 1]) - (s * bulge);
            }

            double tpp = d[m], tqq = d[m + 1], tpq = e[m];
            d[m] = (c * c * tpp) - (2 * c * s * tpq) + (s * s * tqq);
            d[m + 1] = (s * s * tpp) + (2 * c * s * tpq) + (c * c * tqq);
            e[m] = (c * s * (tpp - tqq)) + (((c * c) - (s * s)) * tpq);
            if (m < h - 1)
            {
                bulge = -s * e[m + 1];
                e[m + 1] = c * e[m + 1];
                x = e[m];
                z = bulge;
            }
        }
    }
}
