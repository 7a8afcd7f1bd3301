namespace Partwise.Core.Screening;

/// <summary>
/// Screens validated, strictly positive samples (values in the baseline's part order) against one baseline, reusing
/// its buffers from sample to sample: one instance per batch, not shared between threads.
/// </summary>
internal sealed class ScreeningWorker
{
    private readonly Baseline _baseline;
    private readonly int _reasonCount;
    private readonly double[] _logs;
    private readonly double[] _deviations;
    private readonly double[] _coordinates;
    private readonly double[] _work;
    private readonly int[] _topIndex;
    private readonly double[] _topZ;
    private readonly List<RuleViolation> _violations = [];

    internal ScreeningWorker(Baseline baseline, int reasonCount)
    {
        _baseline = baseline;
        _reasonCount = reasonCount;
        _logs = new double[baseline.PartCount];
        _deviations = new double[baseline.PartCount];
        _coordinates = new double[baseline.Dimension];
        _work = new double[baseline.Dimension];
        _topIndex = new int[reasonCount];
        _topZ = new double[reasonCount];
    }

    /// <summary>d² of one sample: logs, y = (ln x) A, then ‖L⁻¹(y − μ)‖². O(J p + p²).</summary>
    internal double SquaredDistance(ReadOnlySpan<double> values)
    {
        var j = _baseline.PartCount;
        var p = _baseline.Dimension;
        var map = _baseline.MapArray;
        for (var i = 0; i < j; i++)
        {
            _logs[i] = Math.Log(values[i]);
        }

        Array.Clear(_coordinates);
        for (var i = 0; i < j; i++)
        {
            var l = _logs[i];
            var row = map.AsSpan(i * p, p);
            for (var k = 0; k < p; k++)
            {
                _coordinates[k] += l * row[k];
            }
        }

        return CholeskyKernel.SquaredDistance(_coordinates, _baseline.LocationArray, _baseline.FactorArray, p, _work);
    }

    /// <summary>
    /// The full screening of one sample: distance, p-value, reasons and rules. O(J² + J p + p²). Null when d² is not a
    /// finite number (a baseline whose location or covariance is so extreme that the squares overflow); the caller
    /// turns that into a problem at the sample.
    /// </summary>
    internal ScreeningResult? Screen(ReadOnlySpan<double> values)
    {
        var d2 = SquaredDistance(values);
        if (!double.IsFinite(d2))
        {
            return null;
        }

        var exceeds = d2 > _baseline.Threshold;
        var reasons = Reasons(values);
        var violations = Violations(values);
        return new ScreeningResult(d2, ChiSquare.UpperTail(d2, _baseline.Dimension), exceeds, exceeds || violations.Length > 0, reasons, violations);
    }

    // Candidates are the explainable pairs in part order, then the named ratios; the k largest |z| win, the earlier
    // candidate on a tie, so the choice is reproducible.
    private ScreeningReason[] Reasons(ReadOnlySpan<double> values)
    {
        if (_reasonCount == 0)
        {
            return [];
        }

        var pairs = _baseline.Pairs;
        var clr = _baseline.ClrLocationArray;
        for (var i = 0; i < _logs.Length; i++)
        {
            _deviations[i] = _logs[i] - clr[i];
        }

        var filled = 0;
        var first = pairs.First;
        var second = pairs.Second;
        var inverseSd = pairs.InverseSd;
        for (var t = 0; t < first.Length; t++)
        {
            var z = (_deviations[first[t]] - _deviations[second[t]]) * inverseSd[t];
            filled = Offer(t, z, filled);
        }

        var named = _baseline.NamedRatioArray;
        for (var t = 0; t < named.Length; t++)
        {
            var z = (named[t].Ratio.Evaluate(values) - named[t].Location) / named[t].Scale;
            filled = Offer(first.Length + t, z, filled);
        }

        var reasons = new ScreeningReason[filled];
        for (var r = 0; r < filled; r++)
        {
            var t = _topIndex[r];
            if (t < first.Length)
            {
                reasons[r] = new ScreeningReason(pairs.Labels[t], values[first[t]] / values[second[t]], _topZ[r], pairs.Low[t], pairs.High[t]);
            }
            else
            {
                var n = named[t - first.Length];
                var spread = Baseline.ExpectedRangeZ * n.Scale;
                reasons[r] = new ScreeningReason(
                    n.Ratio.Label,
                    RatioValues.Of(n.Ratio, values),
                    _topZ[r],
                    Math.Exp(n.Location - spread),
                    Math.Exp(n.Location + spread));
            }
        }

        return reasons;
    }

    private int Offer(int candidate, double z, int filled)
    {
        var size = Math.Abs(z);
        if (filled == _reasonCount && !(size > Math.Abs(_topZ[filled - 1])))
        {
            return filled;
        }

        var at = filled == _reasonCount ? filled - 1 : filled;
        while (at > 0 && size > Math.Abs(_topZ[at - 1]))
        {
            _topZ[at] = _topZ[at - 1];
            _topIndex[at] = _topIndex[at - 1];
            at--;
        }

        _topZ[at] = z;
        _topIndex[at] = candidate;
        return Math.Min(filled + 1, _reasonCount);
    }

    private RuleViolation[] Violations(ReadOnlySpan<double> values)
    {
        var rules = _baseline.RuleArray;
        if (rules.Length == 0)
        {
            return [];
        }

        _violations.Clear();
        foreach (var rule in rules)
        {
            var value = RatioValues.Of(rule.Ratio, values);
            if (value < rule.Min || value > rule.Max)
            {
                _violations.Add(new RuleViolation(rule.Ratio.Label, value, rule.Min, rule.Max));
            }
        }

        return _violations.Count == 0 ? [] : [.. _violations];
    }
}
