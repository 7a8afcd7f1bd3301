namespace Partwise.Core.Screening;

/// <summary>
/// The search of FAST-MCD (Rousseeuw &amp; Van Driessen 1999, Technometrics 41:212-223) for the h-subset of rows
/// whose covariance has the smallest determinant. It returns the subset; <see cref="RobustScatter"/> turns it into
/// the consistent, reweighted estimate.
/// </summary>
/// <remarks>
/// The steps, with the paper's constants:
/// <list type="number">
/// <item>A trial starts from a random (p + 1)-subset, extended by further random rows while its covariance is
/// singular. The h rows nearest to its mean in its metric form H₁.</item>
/// <item>A C-step (Theorem 1) replaces Hₖ by the h rows with the smallest distances d²(T(Hₖ), S(Hₖ)); it never
/// increases det S. Each trial makes two C-steps; the 10 trials with the lowest determinants are kept and iterated
/// to convergence, and the best of them is the raw MCD subset (500 trials in all).</item>
/// <item>For n &gt; 600 (the paper's nested extensions): up to 1,500 random rows are split into k = min(5, ⌊n/300⌋)
/// disjoint subsets of about 300; each subset runs 500/k trials with h_sub = ⌈n_sub h / n⌉ and keeps its 10 best;
/// these are C-stepped twice in the merged set (h_merged = ⌈n_merged h / n⌉), the 10 best of that are iterated to
/// convergence in the whole data set.</item>
/// </list>
/// A singular h-subset covariance means that h or more rows lie on a hyperplane (the paper's "exact fit"); that is
/// reported as a singular scatter, since no distance could then be computed for the other rows.
/// Random subsets come from <see cref="Random"/> with the caller's seed, so the same seed gives the same subset.
/// </remarks>
internal sealed class FastMcd
{
    internal const int Trials = 500;
    internal const int KeptCandidates = 10;
    internal const int SubsetRows = 300;
    internal const int MaxSubsets = 5;
    internal const int NestedAbove = 600;
    internal const int InitialCSteps = 2;
    internal const int MaxCSteps = 200;

    private readonly double[] _x;
    private readonly int _n;
    private readonly int _p;
    private readonly int _h;
    private readonly Random _random;
    private readonly string _pointer;
    private readonly double[] _mean;
    private readonly double[] _scatter;
    private readonly double[] _factor;
    private readonly double[] _work;
    private readonly double[] _keys;
    private readonly int[] _items;
    private readonly int[] _pool;
    private readonly CancellationToken _cancellationToken;

    // The token is looked at once per trial and once per C-step (each O(n p²)), so a cancelled search stops within one of them.
    internal FastMcd(double[] coordinates, int dimension, int supportSize, int seed, string pointer, CancellationToken cancellationToken = default)
    {
        _cancellationToken = cancellationToken;
        _x = coordinates;
        _p = dimension;
        _n = coordinates.Length / dimension;
        _h = supportSize;
        _random = new Random(seed);
        _pointer = pointer;
        _mean = new double[_p];
        _scatter = new double[_p * _p];
        _factor = new double[_p * _p];
        _work = new double[2 * _p];
        _keys = new double[_n];
        _items = new int[_n];
        _pool = new int[_n];
    }

    /// <summary>Finds the raw MCD subset: h row indices, in no particular order.</summary>
    internal int[] Search()
    {
        var all = Enumerable.Range(0, _n).ToArray();
        if (_h == _n)
        {
            return all;
        }

        var kept = _n > NestedAbove && NestedSubsetsFit() ? NestedCandidates(all) : Candidates(all, _n, _h, Trials);
        return Converge(kept, all);
    }

    // The nested scheme needs room for a (p + 1)-subset inside each h_sub; with very many coordinates it does not.
    private bool NestedSubsetsFit()
    {
        var merged = Math.Min(_n, SubsetRows * MaxSubsets);
        var k = Math.Min(MaxSubsets, _n / SubsetRows);
        return Ceiling(merged / k, _h, _n) > _p + 1;
    }

    private List<Candidate> NestedCandidates(int[] all)
    {
        var merged = Math.Min(_n, SubsetRows * MaxSubsets);
        var k = Math.Min(MaxSubsets, _n / SubsetRows);

        // A random selection of n_merged rows (all of them when n < 1,500), cut into k disjoint subsets.
        var order = (int[])all.Clone();
        for (var i = 0; i < merged; i++)
        {
            Swap(order, i, i + _random.Next(_n - i));
        }

        var mergedRows = order[..merged];
        var pooled = new List<Candidate>();
        var start = 0;
        for (var s = 0; s < k; s++)
        {
            var size = (merged / k) + (s < merged % k ? 1 : 0);
            var members = mergedRows[start..(start + size)];
            start += size;
            pooled.AddRange(Candidates(members, size, Ceiling(size, _h, _n), Trials / k));
        }

        var hMerged = Ceiling(merged, _h, _n);
        var best = new List<Candidate>();
        var support = new int[hMerged];
        foreach (var candidate in pooled)
        {
            _cancellationToken.ThrowIfCancellationRequested();
            candidate.Mean.CopyTo(_mean, 0);
            candidate.Factor.CopyTo(_factor, 0);
            Nearest(mergedRows, merged, hMerged, support);
            Offer(best, RefineTwice(mergedRows, merged, support));
        }

        return best;
    }

    // Random starts in a working set of m rows, two C-steps each; the best KeptCandidates by determinant.
    private List<Candidate> Candidates(int[] members, int m, int h, int trials)
    {
        var best = new List<Candidate>();
        var support = new int[h];
        Array.Copy(members, _pool, m);
        for (var t = 0; t < trials; t++)
        {
            _cancellationToken.ThrowIfCancellationRequested();
            StartFromRandomSubset(m, members, support);
            Offer(best, RefineTwice(members, m, support));
        }

        return best;
    }

    // The paper's initial subsets: a random (p + 1)-subset of the pool, extended one random row at a time while its covariance is
    // singular; then H₁ = the h rows of the working set nearest in its metric.
    private void StartFromRandomSubset(int m, int[] members, int[] support)
    {
        var size = 0;
        for (; size < _p + 1; size++)
        {
            Swap(_pool, size, size + _random.Next(m - size));
        }

        while (!Estimate(_pool.AsSpan(0, size), out _))
        {
            if (size == m)
            {
                throw ExactFit();
            }

            Swap(_pool, size, size + _random.Next(m - size));
            size++;
        }

        Nearest(members, m, support.Length, support);
    }

    private Candidate RefineTwice(int[] members, int m, int[] support)
    {
        double logDet = 0;
        for (var step = 0; step <= InitialCSteps; step++)
        {
            if (!Estimate(support, out logDet))
            {
                throw ExactFit();
            }

            if (step < InitialCSteps)
            {
                Nearest(members, m, support.Length, support);
            }
        }

        return new Candidate((double[])_mean.Clone(), (double[])_factor.Clone(), logDet);
    }

    // C-steps in the whole data set until the determinant stops decreasing; the best subset over all candidates.
    private int[] Converge(List<Candidate> candidates, int[] all)
    {
        var current = new int[_h];
        var next = new int[_h];
        var best = new int[_h];
        var bestLogDet = double.PositiveInfinity;
        foreach (var candidate in candidates)
        {
            candidate.Mean.CopyTo(_mean, 0);
            candidate.Factor.CopyTo(_factor, 0);
            Nearest(all, _n, _h, current);
            if (!Estimate(current, out var logDet))
            {
                throw ExactFit();
            }

            for (var step = 0; step < MaxCSteps; step++)
            {
                _cancellationToken.ThrowIfCancellationRequested();
                Nearest(all, _n, _h, next);
                if (!Estimate(next, out var nextLogDet))
                {
                    throw ExactFit();
                }

                // Theorem 1: det never increases; equality (to rounding) means the subset no longer changes.
                if (!(nextLogDet < logDet - (1e-12 * Math.Max(1, Math.Abs(logDet)))))
                {
                    break;
                }

                (current, next) = (next, current);
                logDet = nextLogDet;
            }

            if (logDet < bestLogDet)
            {
                bestLogDet = logDet;
                current.CopyTo(best, 0);
            }
        }

        return best;
    }

    // Mean, covariance (divisor h) and its Cholesky factor of the given rows into the scratch buffers.
    private bool Estimate(ReadOnlySpan<int> rows, out double logDet)
    {
        SubsetMoments.Compute(_x, _p, rows, rows.Length, _mean, _scatter, _work);
        return CholeskyKernel.TryFactor(_scatter, _p, _factor, out logDet);
    }

    // The h rows of the working set with the smallest d² in the metric of the scratch mean and factor.
    private void Nearest(int[] members, int m, int h, int[] support)
    {
        for (var t = 0; t < m; t++)
        {
            var r = members[t];
            _keys[t] = CholeskyKernel.SquaredDistance(_x.AsSpan(r * _p, _p), _mean, _factor, _p, _work);
            _items[t] = r;
        }

        Array.Sort(_keys, _items, 0, m);
        Array.Copy(_items, support, h);
    }

    private static void Offer(List<Candidate> best, Candidate candidate)
    {
        if (best.Count == KeptCandidates && !(candidate.LogDet < best[^1].LogDet))
        {
            return;
        }

        var at = best.FindIndex(c => candidate.LogDet < c.LogDet);
        best.Insert(at < 0 ? best.Count : at, candidate);
        if (best.Count > KeptCandidates)
        {
            best.RemoveAt(best.Count - 1);
        }
    }

    private Problems.CompositionException ExactFit() =>
        ScatterInput.Singular(
            _pointer,
            $"At least {_h} of the {_n} reference samples lie on a hyperplane of the coordinate space (for example, a ratio that is the same in most of them), so their minimum covariance determinant is singular.");

    private static int Ceiling(int size, int h, int n) => (int)(((long)size * h + n - 1) / n);

    private static void Swap(int[] a, int i, int j) => (a[i], a[j]) = (a[j], a[i]);

    private sealed record Candidate(double[] Mean, double[] Factor, double LogDet);
}
