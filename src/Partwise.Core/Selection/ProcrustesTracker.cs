namespace Partwise.Core.Selection;

/// <summary>
/// The Procrustes correlation between the samples' configuration in all log-ratios, Z = G E, and in a growing set of
/// ratios, X = G B, both in full dimension (Gower 1975, Psychometrika 40:33-51):
/// r = Σ σ_i(E' K0 B) / √(trace(E' K0 E) · trace(B' K0 B)).
/// </summary>
/// <remarks>
/// The singular values of E'K0B are the square roots of the eigenvalues of B'N0B with N0 = K0 F K0, a k × k matrix
/// that grows by one row and column per ratio, so each step costs O(M k + k³) and never touches the data.
/// Taking eigenvalues of the squares loses accuracy only for singular values below about 1e-8 of the largest.
/// </remarks>
internal sealed class ProcrustesTracker
{
    private readonly double[] _k0;
    private readonly double[] _n0;
    private readonly int _m;
    private readonly int _capacity;
    private readonly double _tv;
    private readonly double[] _b;
    private readonly double[] _p;
    private readonly double[] _scratch;
    private readonly double[] _eigen;
    private readonly double[] _work;
    private readonly double[] _nb;
    private int _count;
    private double _traceS;

    /// <param name="k0">K0, row-major M × M.</param>
    /// <param name="n0">N0 = K0 F K0, row-major M × M (copied).</param>
    /// <param name="columns">M.</param>
    /// <param name="totalVariance">trace(E' K0 E).</param>
    /// <param name="capacity">The most ratios that will be added.</param>
    public ProcrustesTracker(double[] k0, double[] n0, int columns, double totalVariance, int capacity)
    {
        _k0 = k0;
        _n0 = (double[])n0.Clone();
        _m = columns;
        _tv = totalVariance;
        _capacity = Math.Max(1, capacity);
        _b = new double[_capacity * columns];
        _p = new double[_capacity * _capacity];
        _scratch = new double[_capacity * _capacity];
        _eigen = new double[_capacity];
        _work = new double[3 * _capacity];
        _nb = new double[columns];
    }

    /// <summary>Adds one ratio's coefficients and returns the correlation of the set so far, in [0, 1].</summary>
    public double Add((int Column, double Value)[] coefficients)
    {
        if (_count == _capacity)
        {
            throw new InvalidOperationException("More ratios than the tracker was sized for.");
        }

        var m = _m;
        var k = _count;
        var b = _b.AsSpan(k * m, m);
        AugmentedColumns.Dense(coefficients, b);
        Array.Clear(_nb);
        foreach (var (col, val) in coefficients)
        {
            for (var r = 0; r < m; r++)
            {
                _nb[r] += val * _n0[(r * m) + col];
            }

            foreach (var (col2, val2) in coefficients)
            {
                _traceS += val * val2 * _k0[(col * m) + col2];
            }
        }

        // The new row and column of P = B'N0B (stride = capacity).
        for (var i = 0; i <= k; i++)
        {
            var bi = _b.AsSpan(i * m, m);
            var s = 0.0;
            for (var r = 0; r < m; r++)
            {
                s += bi[r] * _nb[r];
            }

            _p[(i * _capacity) + k] = s;
            _p[(k * _capacity) + i] = s;
        }

        _count = k + 1;
        return Correlation();
    }

    private double Correlation()
    {
        var k = _count;
        if (_traceS <= 0 || _tv <= 0)
        {
            return 0;
        }

        for (var i = 0; i < k; i++)
        {
            Array.Copy(_p, i * _capacity, _scratch, i * k, k);
        }

        SymmetricEigenvalues.Compute(_scratch, k, _eigen, _work);
        var sum = 0.0;
        for (var i = 0; i < k; i++)
        {
            sum += Math.Sqrt(Math.Max(0, _eigen[i]));
        }

        return Math.Clamp(sum / Math.Sqrt(_tv * _traceS), 0, 1);
    }
}
