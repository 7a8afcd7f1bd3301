using MathNet.Numerics.Distributions;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Tables;

namespace Partwise.Core.Screening;

/// <summary>Options of <see cref="BaselineFit.Fit"/>.</summary>
public sealed record BaselineOptions
{
    /// <summary>The estimator of location and scatter; default <see cref="ScatterMethod.Robust"/>.</summary>
    public ScatterMethod Scatter { get; init; } = ScatterMethod.Robust;

    /// <summary>The quantile of χ²_p that becomes the threshold, in (0, 1); default 0.975.</summary>
    public double Cutoff { get; init; } = Baseline.DefaultCutoff;

    /// <summary>The seed of the robust estimator's random subsets; default <see cref="RobustScatter.DefaultSeed"/>.</summary>
    public int Seed { get; init; } = RobustScatter.DefaultSeed;

    /// <summary>Ratios (typically between named amalgamations) that get their own reference location and scale and serve as reasons.</summary>
    public IReadOnlyList<LogRatio> NamedRatios { get; init; } = [];

    /// <summary>Rules on ratio values.</summary>
    public IReadOnlyList<RatioRule> Rules { get; init; } = [];
}

/// <summary>A fitted baseline with what the fit saw of its reference samples.</summary>
/// <param name="Baseline">The baseline.</param>
/// <param name="Scatter">The location and scatter estimate, with the rows it used.</param>
/// <param name="ReferenceSquaredDistances">d² of each reference sample under the baseline.</param>
/// <param name="ReferenceFlagged">How many reference samples the baseline itself flags (distance, or a rule when the reference compositions were given).</param>
public sealed record FittedBaseline(Baseline Baseline, ScatterEstimate Scatter, IReadOnlyList<double> ReferenceSquaredDistances, int ReferenceFlagged)
{
    /// <summary>The number of reference samples n.</summary>
    public int ReferenceCount => ReferenceSquaredDistances.Count;
}

/// <summary>Fits a screening <see cref="Baseline"/> to reference samples given in log-ratio coordinates.</summary>
public static class BaselineFit
{
    /// <summary>1 / Φ⁻¹(0.75) ≈ 1.4826: scales the median absolute deviation to the standard deviation at the normal model (Rousseeuw &amp; Croux 1993, J. Am. Stat. Assoc. 88:1273-1283).</summary>
    public static readonly double MadConsistency = 1 / Normal.InvCDF(0, 1, 0.75);

    /// <summary>
    /// Estimates the location and scatter of the reference coordinates (<see cref="ClassicalScatter"/> or
    /// <see cref="RobustScatter"/>), the reference location and scale of each named ratio, and builds the baseline.
    /// </summary>
    /// <param name="parts">J ≥ 2 part names.</param>
    /// <param name="coordinateMap">A (J × p, row-major): the map from ln x to the coordinates (see <see cref="Baseline"/>).</param>
    /// <param name="coordinates">The reference samples' coordinates, n × p row-major: (ln x) A for each reference x.</param>
    /// <param name="options">Estimator, cutoff, seed, named ratios and rules; defaults when null.</param>
    /// <param name="reference">
    /// The reference compositions (strictly positive, the zero policy already applied, parts as <paramref name="parts"/>,
    /// n rows in the order of <paramref name="coordinates"/>). Needed when there are named ratios; when given, rules
    /// also count towards <see cref="FittedBaseline.ReferenceFlagged"/>.
    /// </param>
    /// <param name="cancellationToken">Looked at once per FAST-MCD trial and C-step of the robust estimate; once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <remarks>
    /// Named ratios: with the robust scatter, location = median and scale = 1.4826 × median absolute deviation of
    /// ln(ratio) over all reference samples (each ratio on its own, independent of the rows the MCD set aside); with
    /// the classical scatter, the mean and the standard deviation (divisor n − 1).
    /// </remarks>
    /// <exception cref="ArgumentException">Shapes that do not agree; named ratios without reference compositions.</exception>
    /// <exception cref="CompositionException">
    /// <see cref="ProblemTypes.InvalidOption"/> at <c>/cutoff</c>; <see cref="ProblemTypes.TooFewSamples"/> or
    /// <see cref="ProblemTypes.SingularScatter"/> at <c>/rows</c> (a singular scatter, or a named ratio that takes one
    /// value in most reference samples); a zero in the reference compositions at <c>/rows/i/j</c>; the problems of
    /// <see cref="Baseline.Create"/>.
    /// </exception>
    public static FittedBaseline Fit(
        IReadOnlyList<string> parts,
        IReadOnlyList<double> coordinateMap,
        double[] coordinates,
        BaselineOptions? options = null,
        CompositionTable? reference = null,
        CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(coordinateMap);
        ArgumentNullException.ThrowIfNull(coordinates);
        options ??= new BaselineOptions();
        Baseline.ValidateCutoff(options.Cutoff);
        if (parts.Count < 1 || coordinateMap.Count % parts.Count != 0 || coordinateMap.Count == 0)
        {
            throw new ArgumentException($"The coordinate map must have one row per part ({parts.Count}).", nameof(coordinateMap));
        }

        var p = coordinateMap.Count / parts.Count;
        var estimate = options.Scatter == ScatterMethod.Robust
            ? RobustScatter.Fit(coordinates, p, options.Seed, cancellationToken: cancellationToken)
            : ClassicalScatter.Fit(coordinates, p);
        var n = estimate.Count;
        if (reference is not null)
        {
            CheckReference(reference, parts, n);
        }
        else if (options.NamedRatios.Count > 0)
        {
            throw new ArgumentException("Named ratios need the reference compositions.", nameof(reference));
        }

        var named = new RatioBaseline[options.NamedRatios.Count];
        for (var k = 0; k < named.Length; k++)
        {
            named[k] = NamedRatio(options.NamedRatios[k], reference!, options.Scatter);
        }

        var baseline = Baseline.Create(parts, coordinateMap, estimate.Location, estimate.Covariance, options.Scatter, options.Cutoff, named, options.Rules);

        var d2 = new double[n];
        var work = new double[p];
        var flagged = 0;
        for (var i = 0; i < n; i++)
        {
            d2[i] = CholeskyKernel.SquaredDistance(coordinates.AsSpan(i * p, p), baseline.LocationArray, baseline.FactorArray, p, work);
            var isFlagged = d2[i] > baseline.Threshold;
            if (!isFlagged && reference is not null)
            {
                isFlagged = baseline.RuleArray.Any(rule => Violates(rule, reference.Row(i)));
            }

            flagged += isFlagged ? 1 : 0;
        }

        return new FittedBaseline(baseline, estimate, d2, flagged);
    }

    private static void CheckReference(CompositionTable reference, IReadOnlyList<string> parts, int n)
    {
        if (reference.RowCount != n || !reference.Parts.SequenceEqual(parts, StringComparer.Ordinal))
        {
            throw new ArgumentException($"The reference compositions must have the baseline's parts and one row per coordinate row ({n}).", nameof(reference));
        }

        var values = reference.Values;
        var j = reference.PartCount;
        for (var k = 0; k < values.Length; k++)
        {
            if (!(values[k] > 0))
            {
                throw new CompositionException(ProblemTypes.ZeroValue, $"/rows/{k / j}/{k % j}", "A reference sample has a zero here; apply a zero policy before fitting a baseline.");
            }
        }
    }

    private static RatioBaseline NamedRatio(LogRatio ratio, CompositionTable reference, ScatterMethod scatter)
    {
        ArgumentNullException.ThrowIfNull(ratio);
        if (ratio.Numerator.Concat(ratio.Denominator).Any(i => i >= reference.PartCount))
        {
            throw new ArgumentException($"The ratio '{ratio.Label}' refers to a part outside the baseline's parts.", nameof(ratio));
        }

        var n = reference.RowCount;
        var values = new double[n];
        for (var i = 0; i < n; i++)
        {
            values[i] = ratio.Evaluate(reference.Row(i));
        }

        double location, scale;
        if (scatter == ScatterMethod.Robust)
        {
            location = RatioValues.Median(values);
            var deviations = values.Select(v => Math.Abs(v - location)).ToArray();
            scale = MadConsistency * RatioValues.Median(deviations);
        }
        else
        {
            location = values.Average();
            var centre = location;
            scale = n > 1 ? Math.Sqrt(values.Sum(v => (v - centre) * (v - centre)) / (n - 1)) : 0;
        }

        if (!(scale > 0))
        {
            throw new CompositionException(
                ProblemTypes.SingularScatter,
                "/rows",
                $"The ratio '{ratio.Label}' takes the same value in {(scatter == ScatterMethod.Robust ? "at least half of" : "all")} the reference samples, so it has no spread to measure a sample against.");
        }

        return new RatioBaseline(ratio, location, scale);
    }

    private static bool Violates(RatioRule rule, ReadOnlySpan<double> row)
    {
        var value = RatioValues.Of(rule.Ratio, row);
        return value < rule.Min || value > rule.Max;
    }
}
