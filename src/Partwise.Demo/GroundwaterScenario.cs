namespace Partwise.Demo;

/// <summary>
/// The invented groundwater monitoring network of the examples: eight wells analysed for eight major ions (mg/L),
/// a baseline year (2025) and a later half-year (January–June 2026) in which well-11 drifts towards a saline mix.
/// Every number is invented and generated here from a seed; none comes from a real network.
/// </summary>
/// <remarks>
/// <para>Model of one sample of well w, part j (natural logs):
/// ln x_j = ln m_wj + d + a_j f + b_j g + c_j e_j, with independent standard normal d' (d = 0.06 d', a common
/// dilution that log-ratios do not see), f (a carbonate-dissolution factor loading on Ca, Mg, HCO3 and SO4),
/// g (a salinity factor loading on Na, Cl, K and SO4) and e_j (part-specific). The log-concentrations are thus
/// multivariate normal with covariance a a' + b b' + diag(c²) + 0.06² 1 1', which is positive definite by
/// construction; the implied correlations are about 0.8 for Ca–HCO3 and 0.85 for Na–Cl.</para>
/// <para>Drift: in the later period well-11's sample is mixed conservatively with the invented brine end-member
/// <see cref="Brine"/>, x = (1 − φ) x_fresh + φ x_brine, with φ rising linearly from 0 on 2026-01-01 to
/// <see cref="MaxBrineFraction"/> on 2026-06-30, so ln(Na/Ca) and ln(Cl/HCO3) rise.</para>
/// <para>Reporting: a value below the part's detection limit (<see cref="DetectionLimits"/>) is reported as 0, as
/// laboratories report "not detected"; every other value is rounded to two decimals (half away from zero).</para>
/// <para>Determinism: each well draws from its own <see cref="Random"/> seeded from the scenario seed and the well's
/// position, through <see cref="SeededNormal"/>; the same seed gives identical samples on every machine.</para>
/// </remarks>
public sealed class GroundwaterScenario
{
    /// <summary>The seed of the committed demo files.</summary>
    public const int DemoSeed = 20250106;

    /// <summary>The well that drifts towards the brine in the later period.</summary>
    public const string DriftingWell = "well-11";

    /// <summary>The brine fraction φ reached by the drifting well on 2026-06-30.</summary>
    public const double MaxBrineFraction = 0.02;

    private static readonly string[] PartNames = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3"];

    // Standard deviation of the common dilution factor d (log scale).
    private const double DilutionSd = 0.06;

    // Loadings of the carbonate factor f, the salinity factor g and the part-specific sd c (log scale), by part.
    private static readonly double[] CarbonateLoading = [0.09, 0.07, 0.0, 0.0, 0.07, 0.0, 0.03, 0.0];
    private static readonly double[] SalinityLoading = [0.0, 0.0, 0.12, 0.05, 0.0, 0.13, 0.04, 0.0];
    private static readonly double[] OwnSd = [0.04, 0.06, 0.05, 0.25, 0.03, 0.05, 0.10, 0.40];

    private static readonly WellProfile[] Profiles =
    [
        new("well-02", [48.0, 11.5, 14.0, 1.9, 168.0, 21.0, 30.0, 6.5], SamplingCadence.Monthly, 3),
        new("well-03", [62.0, 14.0, 18.0, 2.4, 215.0, 24.0, 41.0, 3.2], SamplingCadence.Weekly, 1),
        new("well-05", [21.0, 5.2, 9.5, 0.13, 78.0, 11.0, 12.0, 1.1], SamplingCadence.Monthly, 8),
        new("well-07", [32.0, 8.1, 12.4, 1.7, 141.0, 17.9, 22.6, 3.1], SamplingCadence.Monthly, 2),
        new("well-08", [74.0, 19.0, 26.0, 3.1, 262.0, 33.0, 58.0, 0.06], SamplingCadence.Monthly, 14),
        new("well-11", [39.0, 9.6, 15.5, 1.8, 152.0, 19.5, 25.0, 2.4], SamplingCadence.Weekly, 2),
        new("well-12", [55.0, 16.0, 21.0, 2.7, 198.0, 28.0, 47.0, 9.8], SamplingCadence.Monthly, 21),
        new("well-14", [27.0, 6.4, 11.0, 0.6, 104.0, 15.0, 17.0, 0.4], SamplingCadence.Monthly, 10),
    ];

    private static readonly double[] BrineValues = [820.0, 640.0, 7600.0, 260.0, 180.0, 13100.0, 1450.0, 0.0];

    private static readonly double[] DetectionLimitValues = [0.5, 0.1, 0.5, 0.1, 1.0, 0.5, 0.5, 0.05];

    private static readonly DateOnly BaselineStart = new(2025, 1, 1);
    private static readonly DateOnly BaselineEnd = new(2025, 12, 31);
    private static readonly DateOnly LaterStart = new(2026, 1, 1);
    private static readonly DateOnly LaterEnd = new(2026, 6, 30);

    private GroundwaterScenario(int seed, IReadOnlyList<WaterSample> samples)
    {
        Seed = seed;
        Samples = samples;
        Baseline = [.. samples.Where(s => s.Period == MonitoringPeriod.Baseline)];
        Later = [.. samples.Where(s => s.Period == MonitoringPeriod.Later)];
    }

    /// <summary>The eight major ions, in table order: Ca, Mg, Na, K, HCO3, Cl, SO4, NO3 (all mg/L).</summary>
    public static IReadOnlyList<string> Parts => PartNames;

    /// <summary>The invented wells, in id order.</summary>
    public static IReadOnlyList<WellProfile> Wells => Profiles;

    /// <summary>
    /// The invented brine end-member (mg/L, table order): Ca 820, Mg 640, Na 7600, K 260, HCO3 180, Cl 13100,
    /// SO4 1450, NO3 0.
    /// </summary>
    public static IReadOnlyList<double> Brine => BrineValues;

    /// <summary>
    /// Detection limits in mg/L (invented, of a usual order for ion chromatography and titration): Ca 0.5, Mg 0.1,
    /// Na 0.5, K 0.1, HCO3 1, Cl 0.5, SO4 0.5, NO3 0.05. Values below them are reported as 0; in practice only
    /// NO3 (well-08) and K (well-05) fall below.
    /// </summary>
    public static IReadOnlyDictionary<string, double> DetectionLimits { get; } =
        PartNames.Select((p, j) => (p, j)).ToDictionary(t => t.p, t => DetectionLimitValues[t.j], StringComparer.Ordinal);

    /// <summary>The seed this scenario was generated from.</summary>
    public int Seed { get; }

    /// <summary>Every sample, grouped by well (in <see cref="Wells"/> order), each well's samples by date.</summary>
    public IReadOnlyList<WaterSample> Samples { get; }

    /// <summary>The 2025 samples of all wells.</summary>
    public IReadOnlyList<WaterSample> Baseline { get; }

    /// <summary>The January–June 2026 samples of all wells.</summary>
    public IReadOnlyList<WaterSample> Later { get; }

    /// <summary>The index of a part in <see cref="Parts"/>, or −1.</summary>
    public static int IndexOf(string part) => Array.IndexOf(PartNames, part);

    /// <summary>
    /// Generates the scenario from <paramref name="seed"/> (any int); the same seed always gives the same samples,
    /// value for value, on every machine.
    /// </summary>
    public static GroundwaterScenario Create(int seed)
    {
        var samples = new List<WaterSample>();
        for (var w = 0; w < Profiles.Length; w++)
        {
            var well = Profiles[w];
            var normal = new SeededNormal(unchecked((seed * 31) + w + 1));
            foreach (var date in Schedule(well, BaselineStart, BaselineEnd))
            {
                samples.Add(Draw(well, date, MonitoringPeriod.Baseline, 0.0, normal));
            }

            foreach (var date in Schedule(well, LaterStart, LaterEnd))
            {
                var phi = well.Id == DriftingWell
                    ? MaxBrineFraction * (date.DayNumber - LaterStart.DayNumber) / (LaterEnd.DayNumber - LaterStart.DayNumber)
                    : 0.0;
                samples.Add(Draw(well, date, MonitoringPeriod.Later, phi, normal));
            }
        }

        return new GroundwaterScenario(seed, samples);
    }

    /// <summary>The samples of one well, by date.</summary>
    public IReadOnlyList<WaterSample> OfWell(string well, MonitoringPeriod period) =>
        [.. Samples.Where(s => s.Well == well && s.Period == period)];

    private static IEnumerable<DateOnly> Schedule(WellProfile well, DateOnly start, DateOnly end)
    {
        if (well.Cadence == SamplingCadence.Monthly)
        {
            for (var month = new DateOnly(start.Year, start.Month, well.Offset); month <= end; month = month.AddMonths(1))
            {
                yield return month;
            }

            yield break;
        }

        var firstMonday = start.AddDays(((int)DayOfWeek.Monday - (int)start.DayOfWeek + 7) % 7);
        for (var day = firstMonday.AddDays(well.Offset); day <= end; day = day.AddDays(7))
        {
            yield return day;
        }
    }

    private static WaterSample Draw(WellProfile well, DateOnly date, MonitoringPeriod period, double brineFraction, SeededNormal normal)
    {
        var j = PartNames.Length;
        var dilution = DilutionSd * normal.Next();
        var carbonate = normal.Next();
        var salinity = normal.Next();
        var values = new double[j];
        for (var k = 0; k < j; k++)
        {
            var log = PortableMath.Log(well.Mean[k]) + dilution + (CarbonateLoading[k] * carbonate) + (SalinityLoading[k] * salinity) + (OwnSd[k] * normal.Next());
            var fresh = PortableMath.Exp(log);
            var mixed = ((1.0 - brineFraction) * fresh) + (brineFraction * BrineValues[k]);
            values[k] = mixed < DetectionLimitValues[k] ? 0.0 : Math.Round(mixed, 2, MidpointRounding.AwayFromZero);
        }

        // Each well is sampled at its own hour of the morning, in UTC.
        var observedAt = new DateTimeOffset(date.ToDateTime(new TimeOnly(8 + (well.Offset % 4), 30)), TimeSpan.Zero);
        var id = $"{well.Id}/{date.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture)}";
        return new WaterSample(id, well.Id, observedAt, period, values, brineFraction);
    }
}
