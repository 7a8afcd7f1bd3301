namespace Partwise.Core.Selection;

/// <summary>
/// The sufficient statistics of stepwise log-ratio selection (Greenacre 2019, Math. Geosci. 51:649-682), in the form of
/// Partwise's methods: K, the Gram of the augmented logs G after removing the chosen ratios, and N = K F K with
/// F = E E' = D_w − w w' on the part columns (zero elsewhere), where Z = G E is the weighted clr,
/// E = [(I − w 1') D_w^(1/2); 0]. The variance a candidate b adds is b'N b / b'K b; adding b updates K and N by rank-one
/// terms in O(M²) for M = J + the number of sum columns.
/// </summary>
internal sealed class ResidualGram
{
    private readonly double[] _w;
    private readonly double[] _u;
    private readonly double[] _v;
    private readonly double[] _t;

    /// <param name="k0">The M × M row-major K0 (copied).</param>
    /// <param name="columns">M.</param>
    /// <param name="w">The J part weights (Σ w = 1).</param>
    /// <param name="cancellationToken">Looked at once per row of N (M J products each); once cancelled the constructor throws <see cref="OperationCanceledException"/>.</param>
    public ResidualGram(double[] k0, int columns, double[] w, CancellationToken cancellationToken = default)
    {
        M = columns;
        J = w.Length;
        _w = w;
        K = (double[])k0.Clone();
        N = new double[M * M];
        _u = new double[M];
        _v = new double[M];
        _t = new double[M];

        // TV = trace(E' K0 E) = Σ_j w_j K_jj − w' K_JJ w.
        var tv = 0.0;
        for (var a = 0; a < J; a++)
        {
            var row = a * M;
            var kw = 0.0;
            for (var b = 0; b < J; b++)
            {
                kw += K[row + b] * w[b];
            }

            tv += w[a] * (K[row + a] - kw);
        }

        TotalVariance = tv;
        var trace = 0.0;
        for (var c = 0; c < M; c++)
        {
            trace += K[(c * M) + c];
        }

        Trace0 = trace;

        // N = K F K = (K_:J D_w − (K_:J w) w') K_J: .
        var kf = new double[M * J];
        for (var r = 0; r < M; r++)
        {
            var row = r * M;
            var kw = 0.0;
            for (var b = 0; b < J; b++)
            {
                kw += K[row + b] * w[b];
            }

            for (var b = 0; b < J; b++)
            {
                kf[(r * J) + b] = (K[row + b] - kw) * w[b];
            }
        }

        for (var r = 0; r < M; r++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            for (var c = r; c < M; c++)
            {
                var acc = 0.0;
                for (var b = 0; b < J; b++)
                {
                    acc += kf[(r * J) + b] * K[(b * M) + c];
                }

                N[(r * M) + c] = acc;
                N[(c * M) + r] = acc;
            }
        }
    }

    /// <summary>M, the number of augmented columns.</summary>
    public int M { get; }

    /// <summary>J, the number of parts.</summary>
    public int J { get; }

    /// <summary>The residual Gram K (row-major M × M).</summary>
    public double[] K { get; }

    /// <summary>N = K F K (row-major M × M).</summary>
    public double[] N { get; }

    /// <summary>TV = trace(E' K0 E) = Σ_j w_j var(clr_j), divisor as in K0.</summary>
    public double TotalVariance { get; }

    /// <summary>trace(K0), the scale of the dependence tolerance.</summary>
    public double Trace0 { get; }

    /// <summary>
    /// A ratio depends on those already in when its residual variance b'K b ≤ 1e-12 trace(K0) · (b'b / 2); for a
    /// candidate e_p − e_q that is the rule b'K b ≤ 1e-12 trace(K0) of the method.
    /// </summary>
    public double Tolerance(double bNormSquared) => 1e-12 * Trace0 * (bNormSquared / 2);

    /// <summary>b'K b for a candidate e_p − e_q.</summary>
    public double PairResidual(int p, int q) => K[(p * M) + p] + K[(q * M) + q] - (2 * K[(p * M) + q]);

    /// <summary>b'K b for sparse coefficients.</summary>
    public double Residual((int Column, double Value)[] b)
    {
        var s = 0.0;
        foreach (var (c1, v1) in b)
        {
            foreach (var (c2, v2) in b)
            {
                s += v1 * v2 * K[(c1 * M) + c2];
            }
        }

        return s;
    }

    /// <summary>b'N b for sparse coefficients.</summary>
    public double Explained((int Column, double Value)[] b)
    {
        var s = 0.0;
        foreach (var (c1, v1) in b)
        {
            foreach (var (c2, v2) in b)
            {
                s += v1 * v2 * N[(c1 * M) + c2];
            }
        }

        return s;
    }

    /// <summary>
    /// Removes b from K and N: u = K b, c = b'u, v = K F u (before the update), then
    /// K ← K − u u'/c and N ← N − (v u' + u v')/c + (u'F u) u u'/c². Returns b'N b / c, the variance b adds.
    /// The caller has checked that c is above the dependence tolerance.
    /// </summary>
    public double Add((int Column, double Value)[] b)
    {
        var m = M;
        var u = _u;
        var v = _v;
        Array.Clear(u);
        foreach (var (col, val) in b)
        {
            // K is symmetric, so its column is its row: a contiguous update.
            DenseKernels.AddScaled(u, val, K.AsSpan(col * m, m));
        }

        var c = 0.0;
        foreach (var (col, val) in b)
        {
            c += val * u[col];
        }

        var bn = Explained(b);

        // t = F u = w∘u_J − w (w'u_J); v = K_:J t; u'F u = u_J' t.
        var wu = 0.0;
        for (var a = 0; a < J; a++)
        {
            wu += _w[a] * u[a];
        }

        var ufu = 0.0;
        for (var a = 0; a < J; a++)
        {
            _t[a] = _w[a] * (u[a] - wu);
            ufu += u[a] * _t[a];
        }

        var t = _t.AsSpan(0, J);
        for (var r = 0; r < m; r++)
        {
            v[r] = DenseKernels.Dot(K.AsSpan(r * m, J), t);
        }

        var inv = 1.0 / c;
        var quad = ufu * inv * inv;
        for (var r = 0; r < m; r++)
        {
            var ur = u[r];
            DenseKernels.AddScaled(K.AsSpan(r * m, m), -ur * inv, u);
            DenseKernels.AddScaled2(N.AsSpan(r * m, m), (ur * quad) - (v[r] * inv), u, -ur * inv, v);
        }

        return bn * inv;
    }
}
