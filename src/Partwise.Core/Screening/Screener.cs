using System.Globalization;
using Partwise.Core.Problems;

namespace Partwise.Core.Screening;

/// <summary>
/// Screens samples against a <see cref="Baseline"/>: the squared Mahalanobis distance of each sample's coordinates,
/// its chi-square p-value, the flag, the rules it violates and the ratios that explain it. Flags are statistical
/// signals for review by a qualified analyst, not decisions.
/// </summary>
/// <remarks>
/// <para>For a sample x (strictly positive, one value per baseline part): y = (ln x) A,
/// d² = (y − μ)ᵀ Σ⁻¹ (y − μ) (computed as ‖L⁻¹(y − μ)‖² with Σ = L Lᵀ), p-value = 1 − F_χ²(d²; p), and the sample is
/// flagged when d² &gt; χ²_p(cutoff) or a rule is violated (Filzmoser &amp; Hron 2008, Math. Geosci. 40:233-248).</para>
/// <para>Reasons: the <c>reasonCount</c> ratios (default 3) with the largest |z| among all pairwise ratios the
/// baseline explains (ln(x_i / x_j) with i before j in part order) and its named ratios, whether or not the sample
/// is flagged; z = (aᵀ ln x − aᵀ μ_clr) / √(aᵀ S_clr a) for a pairwise ratio, (ln r − location) / scale for a named
/// one. Ties go to the earlier candidate. All pairwise z-scores together cost O(J²) per sample.</para>
/// <para>Zeros: the zero policy is the caller's, applied before screening (the same policy as the baseline's
/// reference samples, so that a replaced value means the same in both); a zero that reaches screening is refused,
/// since its log-ratios are infinite.</para>
/// <para>The batch methods validate every sample first (all-or-nothing, at most 20 problems listed) and then
/// screen with one set of buffers; only the results are allocated per sample.</para>
/// </remarks>
public static class Screener
{
    /// <summary>The number of reasons reported per sample unless asked otherwise: 3.</summary>
    public const int DefaultReasonCount = 3;

    private const int MaxListedProblems = 20;

    /// <summary>Screens one sample given as values by part name.</summary>
    /// <param name="baseline">The baseline.</param>
    /// <param name="values">One finite, positive value for each of the baseline's parts and no other part.</param>
    /// <param name="reasonCount">How many reasons to report, ≥ 0.</param>
    /// <param name="pointer">JSON pointer of <paramref name="values"/> in the request; problems point at <c>{pointer}/{part}</c>.</param>
    /// <exception cref="CompositionException">
    /// A missing part (<see cref="ProblemTypes.MissingPart"/>), a part the baseline does not have
    /// (<see cref="ProblemTypes.UnknownPart"/>), a value that is not finite, negative or zero.
    /// </exception>
    public static ScreeningResult Screen(Baseline baseline, IReadOnlyDictionary<string, double> values, int reasonCount = DefaultReasonCount, string pointer = "/sample/values")
    {
        ArgumentNullException.ThrowIfNull(values);
        return ScreenMany(baseline, [values], reasonCount, (_, __) => pointer)[0];
    }

    /// <summary>Screens many samples given as values by part name; problems point at <c>{pointer}/{i}/values/{part}</c>.</summary>
    /// <param name="baseline">The baseline.</param>
    /// <param name="samples">Each: one finite, positive value for each of the baseline's parts and no other part.</param>
    /// <param name="reasonCount">How many reasons to report per sample, ≥ 0.</param>
    /// <param name="pointer">JSON pointer of the list of samples in the request, default <c>/samples</c>.</param>
    /// <returns>One result per sample, in order.</returns>
    /// <exception cref="CompositionException">As for <see cref="Screen"/>, for any sample; nothing is screened then.</exception>
    public static ScreeningResult[] ScreenMany(Baseline baseline, IReadOnlyList<IReadOnlyDictionary<string, double>> samples, int reasonCount = DefaultReasonCount, string pointer = "/samples")
    {
        ArgumentNullException.ThrowIfNull(pointer);
        return ScreenMany(baseline, samples, reasonCount, (prefix, i) => string.Create(CultureInfo.InvariantCulture, $"{prefix}/{i}/values"), pointer);
    }

    /// <summary>
    /// Screens many samples given as a row-major m × J array in the baseline's part order; problems point at
    /// <c>{pointer}/{i}/{j}</c>.
    /// </summary>
    /// <param name="baseline">The baseline.</param>
    /// <param name="rows">m × J finite, positive values.</param>
    /// <param name="reasonCount">How many reasons to report per sample, ≥ 0.</param>
    /// <param name="pointer">JSON pointer of the rows in the request, default <c>/rows</c>.</param>
    /// <exception cref="ArgumentException">A length that is not a multiple of J.</exception>
    /// <exception cref="CompositionException">A value that is not finite, negative or zero; nothing is screened then.</exception>
    public static ScreeningResult[] ScreenRows(Baseline baseline, ReadOnlySpan<double> rows, int reasonCount = DefaultReasonCount, string pointer = "/rows")
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentOutOfRangeException.ThrowIfNegative(reasonCount);
        var j = baseline.PartCount;
        var m = ValidateRows(rows, j, pointer);
        var worker = new ScreeningWorker(baseline, reasonCount);
        var results = new ScreeningResult[m];
        for (var i = 0; i < m; i++)
        {
            results[i] = worker.Screen(rows.Slice(i * j, j)) ?? throw NonFiniteDistance(string.Create(CultureInfo.InvariantCulture, $"{pointer}/{i}"));
        }

        return results;
    }

    /// <summary>
    /// The squared Mahalanobis distances d² alone of a row-major m × J array in the baseline's part order, written to
    /// <paramref name="destination"/> (length ≥ m); no reasons, rules or allocation per row.
    /// </summary>
    /// <exception cref="ArgumentException">A length that is not a multiple of J, or a destination that is too short.</exception>
    /// <exception cref="CompositionException">A value that is not finite, negative or zero.</exception>
    public static void SquaredDistances(Baseline baseline, ReadOnlySpan<double> rows, Span<double> destination, string pointer = "/rows")
    {
        ArgumentNullException.ThrowIfNull(baseline);
        var j = baseline.PartCount;
        var m = ValidateRows(rows, j, pointer);
        if (destination.Length < m)
        {
            throw new ArgumentException($"The destination holds {destination.Length} values, fewer than the {m} rows.", nameof(destination));
        }

        var worker = new ScreeningWorker(baseline, 0);
        for (var i = 0; i < m; i++)
        {
            destination[i] = worker.SquaredDistance(rows.Slice(i * j, j));
        }
    }

    private static ScreeningResult[] ScreenMany(
        Baseline baseline,
        IReadOnlyList<IReadOnlyDictionary<string, double>> samples,
        int reasonCount,
        Func<string, int, string> samplePointer,
        string prefix = "")
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(samples);
        ArgumentOutOfRangeException.ThrowIfNegative(reasonCount);
        var j = baseline.PartCount;
        var parts = baseline.Parts;
        var rows = new double[checked(samples.Count * j)];
        var errors = new List<ProblemError>();
        string? type = null;
        for (var i = 0; i < samples.Count && errors.Count < MaxListedProblems; i++)
        {
            var sample = samples[i] ?? throw new ArgumentException($"Sample {i} is null.", nameof(samples));
            string? at = null;
            var found = 0;
            for (var k = 0; k < j; k++)
            {
                if (sample.TryGetValue(parts[k], out var v))
                {
                    found++;
                    rows[(i * j) + k] = v;
                    if (ValueProblem(v) is { } problem)
                    {
                        at ??= samplePointer(prefix, i);
                        Add(problem.Type, $"{at}/{JsonPointer.Escape(parts[k])}", problem.Detail);
                    }
                }
                else
                {
                    at ??= samplePointer(prefix, i);
                    Add(ProblemTypes.MissingPart, $"{at}/{JsonPointer.Escape(parts[k])}", $"The sample has no value for the baseline's part '{parts[k]}'.");
                }
            }

            if (sample.Count > found)
            {
                at ??= samplePointer(prefix, i);
                foreach (var name in sample.Keys)
                {
                    if (!parts.Contains(name))
                    {
                        Add(ProblemTypes.UnknownPart, $"{at}/{JsonPointer.Escape(name)}", $"The baseline has no part named '{name}'.");
                    }
                }
            }
        }

        if (type is not null)
        {
            throw new CompositionException(type, $"{errors.Count} value(s) of the samples cannot be screened.", errors);
        }

        var worker = new ScreeningWorker(baseline, reasonCount);
        var results = new ScreeningResult[samples.Count];
        for (var i = 0; i < results.Length; i++)
        {
            results[i] = worker.Screen(rows.AsSpan(i * j, j)) ?? throw NonFiniteDistance(samplePointer(prefix, i));
        }

        return results;

        void Add(string problemType, string pointer, string detail)
        {
            if (errors.Count < MaxListedProblems)
            {
                type ??= problemType;
                errors.Add(new ProblemError(pointer, detail));
            }
        }
    }

    private static int ValidateRows(ReadOnlySpan<double> rows, int j, string pointer)
    {
        ArgumentNullException.ThrowIfNull(pointer);
        if (rows.Length % j != 0)
        {
            throw new ArgumentException($"The rows hold {rows.Length} values, not a whole number of rows of {j} parts.", nameof(rows));
        }

        List<ProblemError>? errors = null;
        string? type = null;
        for (var k = 0; k < rows.Length; k++)
        {
            if (ValueProblem(rows[k]) is { } problem)
            {
                errors ??= [];
                type ??= problem.Type;
                errors.Add(new ProblemError(string.Create(CultureInfo.InvariantCulture, $"{pointer}/{k / j}/{k % j}"), problem.Detail));
                if (errors.Count == MaxListedProblems)
                {
                    break;
                }
            }
        }

        return errors is null
            ? rows.Length / j
            : throw new CompositionException(type!, $"{errors.Count} value(s) of the samples cannot be screened.", errors);
    }

    private static (string Type, string Detail)? ValueProblem(double v)
    {
        if (v > 0 && double.IsFinite(v))
        {
            return null;
        }

        if (!double.IsFinite(v))
        {
            return (ProblemTypes.NonFiniteValue, "The value is not a finite number.");
        }

        return v < 0
            ? (ProblemTypes.NegativeValue, $"The value {v.ToString("R", CultureInfo.InvariantCulture)} is negative; compositions are non-negative.")
            : (ProblemTypes.ZeroValue, "The value is zero; apply the baseline's zero policy before screening, since a zero has no log-ratio.");
    }

    private static CompositionException NonFiniteDistance(string pointer) => new(
        ProblemTypes.NonFiniteValue,
        pointer,
        "The squared distance of this sample from the baseline's centre is not a finite number: the baseline's location or covariance is too extreme for these values.");
}
