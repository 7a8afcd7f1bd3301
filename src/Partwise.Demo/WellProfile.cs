namespace Partwise.Demo;

/// <summary>How often a well is sampled.</summary>
public enum SamplingCadence
{
    /// <summary>Once a month, on the well's own day of the month.</summary>
    Monthly,

    /// <summary>Once a week, on the well's own weekday.</summary>
    Weekly,
}

/// <summary>An invented well: its usual composition and its sampling schedule.</summary>
/// <param name="Id">The well id, for example <c>well-07</c>.</param>
/// <param name="Mean">The well's typical concentrations in mg/L (geometric means), in the order of <see cref="GroundwaterScenario.Parts"/>.</param>
/// <param name="Cadence">How often it is sampled.</param>
/// <param name="Offset">The day of the month (monthly, 1–28) or days after the first Monday of the period (weekly, 0–6).</param>
public sealed record WellProfile(string Id, IReadOnlyList<double> Mean, SamplingCadence Cadence, int Offset);
