namespace Partwise.Demo;

/// <summary>The monitoring period a sample belongs to.</summary>
public enum MonitoringPeriod
{
    /// <summary>2025: every well at its usual composition; the reference samples of a baseline.</summary>
    Baseline,

    /// <summary>January to June 2026: the samples screened against the baseline; the drifting well mixes with brine.</summary>
    Later,
}

/// <summary>One invented laboratory analysis of a well: eight major ions in mg/L.</summary>
/// <param name="Id">The sample id, <c>well/yyyy-MM-dd</c>, unique in the scenario.</param>
/// <param name="Well">The well id, for example <c>well-07</c>.</param>
/// <param name="ObservedAt">When the sample was taken (UTC).</param>
/// <param name="Period">The monitoring period.</param>
/// <param name="Values">Concentrations in mg/L in the order of <see cref="GroundwaterScenario.Parts"/>, rounded to two decimals; 0 means below the part's detection limit.</param>
/// <param name="BrineFraction">The true mass fraction of the brine end-member mixed into the sample (0 except in the drifting well's later samples); known only because the data are invented.</param>
public sealed record WaterSample(
    string Id,
    string Well,
    DateTimeOffset ObservedAt,
    MonitoringPeriod Period,
    IReadOnlyList<double> Values,
    double BrineFraction)
{
    /// <summary>The value of one part by name.</summary>
    /// <exception cref="ArgumentException">The part is not one of <see cref="GroundwaterScenario.Parts"/>.</exception>
    public double ValueOf(string part)
    {
        var j = GroundwaterScenario.IndexOf(part);
        return j >= 0 ? Values[j] : throw new ArgumentException($"There is no part named '{part}'.", nameof(part));
    }
}
