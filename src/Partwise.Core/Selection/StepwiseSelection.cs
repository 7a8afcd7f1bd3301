using Partwise.Core.Problems;
using Partwise.Core.Ratios;

namespace Partwise.Core.Selection;

/// <summary>
/// Greedy forward selection of log-ratios (Greenacre 2019, Math. Geosci. 51:649-682) on the sufficient statistics K0:
/// forced ratios first, then at each step the candidate with the largest b'N b / b'K b, with rank-one updates.
/// </summary>
internal static class StepwiseSelection
{
    /// <summary>Candidates whose explained fractions are within this of the best tie; the first in candidate order wins.</summary>
    internal const double TieTolerance = 1e-9;

    /// <summary>A step "reaches" stop.explained when its fraction is at least the target less this rounding allowance.</summary>
    internal const double ReachTolerance = 1e-12;

    public static RatioSelectionResult Run(SelectionInputs inputs, double[] k0, double[] weights, string dataPointer, CancellationToken cancellationToken = default)
    {
        var columns = inputs.Columns;
        var m = columns.Count;
        var gram = new ResidualGram(k0, m, weights, cancellationToken);
        var tv = gram.TotalVariance;
        if (!(tv > 1e-12 * gram.Trace0) || !double.IsFinite(tv))
        {
            throw new CompositionException(ProblemTypes.NoVariation, dataPointer, "The compositions have no log-ratio variance (they are all proportional), so there is nothing to explain.");
        }

        var tracker = new ProcrustesTracker(k0, gram.N, m, tv, inputs.MaxRatios);
        var steps = new List<SelectionStep>(inputs.MaxRatios);
        var chosen = new List<LogRatio>(inputs.MaxRatios);
        var explained = 0.0;

        for (var i = 0; i < inputs.Forced.Length; i++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var ratio = inputs.Forced[i];
            var b = columns.Coefficients(ratio)!;
            var norm = b.Sum(t => t.Value * t.Value);
            var residual = gram.Residual(b);
            if (!(residual > gram.Tolerance(norm)))
            {
                var detail = !(Quadratic(k0, m, b) > gram.Tolerance(norm))
                    ? $"The forced ratio {ratio.Label} does not vary over the samples."
                    : $"The forced ratio {ratio.Label} is, on these data, a combination of the forced ratios before it (it closes a cycle or repeats one), so it adds nothing.";
                throw new CompositionException(ProblemTypes.DependentRatio, $"/force/{i}", detail);
            }

            var gain = Math.Max(0, gram.Add(b) / tv);
            explained += gain;
            steps.Add(new SelectionStep(ratio, ratio.Label, Math.Min(1, explained), gain, tracker.Add(b), Forced: true));
            chosen.Add(ratio);
        }

        var (candP, candQ) = Candidates(inputs);
        var fractions = new double[candP.Length];
        var kk = gram.K;
        var nn = gram.N;
        while (steps.Count < inputs.MaxRatios && explained < inputs.Target - ReachTolerance)
        {
            // A step scans every candidate and updates K and N: O(M²), looked at once per step.
            cancellationToken.ThrowIfCancellationRequested();
            var tolerance = gram.Tolerance(2);
            var best = double.NegativeInfinity;
            for (var c = 0; c < candP.Length; c++)
            {
                int p = candP[c], q = candQ[c];
                int pp = (p * m) + p, qq = (q * m) + q, pq = (p * m) + q;
                var den = kk[pp] + kk[qq] - (2 * kk[pq]);
                if (!(den > tolerance))
                {
                    fractions[c] = double.NegativeInfinity;
                    continue;
                }

                var f = (nn[pp] + nn[qq] - (2 * nn[pq])) / den / tv;
                fractions[c] = f;
                if (f > best)
                {
                    best = f;
                }
            }

            if (double.IsNegativeInfinity(best))
            {
                break;
            }

            var pick = 0;
            while (fractions[pick] < best - TieTolerance)
            {
                pick++;
            }

            var ratio = CandidateRatio(inputs, candP[pick], candQ[pick]);
            (int, double)[] coefficients = [(candP[pick], 1.0), (candQ[pick], -1.0)];
            var gain = Math.Max(0, gram.Add(coefficients) / tv);
            explained += gain;
            steps.Add(new SelectionStep(ratio, ratio.Label, Math.Min(1, explained), gain, tracker.Add(coefficients), Forced: false));
            chosen.Add(ratio);
        }

        return new RatioSelectionResult(
            inputs.Parts,
            tv,
            "n",
            steps,
            RatioGraph.Build(inputs.Parts, chosen, inputs.Amalgamations),
            RatioReconstruction.IsInvertible(inputs.Parts, chosen));
    }

    /// <summary>b'A b for a row-major M × M matrix and sparse coefficients.</summary>
    internal static double Quadratic(double[] a, int m, (int Column, double Value)[] b)
    {
        var s = 0.0;
        foreach (var (c1, v1) in b)
        {
            foreach (var (c2, v2) in b)
            {
                s += v1 * v2 * a[(c1 * m) + c2];
            }
        }

        return s;
    }

    /// <summary>
    /// The candidates in their fixed order: pairs (p, q), p &lt; q, over the part columns then the named sums; a pair of
    /// parts; a part and an amalgamation without it; two amalgamations without a common part. Excluded parts, and
    /// amalgamations containing them, take no part.
    /// </summary>
    internal static (int[] P, int[] Q) Candidates(SelectionInputs inputs)
    {
        var j = inputs.Parts.Count;
        var named = inputs.Named;
        var count = j + named.Length;
        var usable = new bool[count];
        for (var c = 0; c < j; c++)
        {
            usable[c] = !inputs.Excluded[c];
        }

        for (var a = 0; a < named.Length; a++)
        {
            usable[j + a] = named[a].All(x => !inputs.Excluded[x]);
        }

        var ps = new List<int>();
        var qs = new List<int>();
        for (var p = 0; p < count; p++)
        {
            if (!usable[p])
            {
                continue;
            }

            for (var q = p + 1; q < count; q++)
            {
                if (!usable[q])
                {
                    continue;
                }

                var ok = (p < j, q < j) switch
                {
                    (true, true) => true,
                    (true, false) => Array.IndexOf(named[q - j], p) < 0,
                    (false, true) => Array.IndexOf(named[p - j], q) < 0,
                    _ => !named[p - j].Intersect(named[q - j]).Any(),
                };
                if (ok)
                {
                    ps.Add(p);
                    qs.Add(q);
                }
            }
        }

        return ([.. ps], [.. qs]);
    }

    /// <summary>The ratio of candidate (p, q): column p over column q, named amalgamations labelled by name.</summary>
    internal static LogRatio CandidateRatio(SelectionInputs inputs, int p, int q)
    {
        var j = inputs.Parts.Count;
        (int[] Side, string? Name) Side(int c) =>
            c < j ? ([c], null) : ((int[])inputs.Named[c - j].Clone(), inputs.Amalgamations[c - j].Name);
        var (num, numName) = Side(p);
        var (den, denName) = Side(q);
        var kind = p < j && q < j ? RatioKind.Pairwise : RatioKind.Amalgamation;
        return LogRatio.FromIndices(inputs.Parts, num, den, kind, "", numName, denName);
    }
}
