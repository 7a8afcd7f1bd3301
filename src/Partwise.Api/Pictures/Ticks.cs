namespace Partwise.Api.Pictures;

/// <summary>Round tick values for an axis: steps of 1, 2 or 5 times a power of ten (common practice).</summary>
public static class Ticks
{
    /// <summary>About <paramref name="count"/> round values from the first multiple of the step ≥ <paramref name="min"/> to ≤ <paramref name="max"/>.</summary>
    public static IReadOnlyList<double> Between(double min, double max, int count = 5)
    {
        if (!(max > min) || !double.IsFinite(min) || !double.IsFinite(max) || count < 1)
        {
            return [min];
        }

        var raw = (max - min) / count;
        var power = Math.Pow(10, Math.Floor(Math.Log10(raw)));
        var fraction = raw / power;
        var step = (fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10) * power;
        var ticks = new List<double>();
        for (var k = Math.Ceiling(min / step); k * step <= max + (1e-9 * step); k++)
        {
            ticks.Add(Math.Round(k * step / power) * power);
        }

        return ticks;
    }

    /// <summary>A tick label: no more decimals than the step needs.</summary>
    public static string Label(double value, IReadOnlyList<double> ticks)
    {
        ArgumentNullException.ThrowIfNull(ticks);
        var step = ticks.Count > 1 ? Math.Abs(ticks[1] - ticks[0]) : 1;
        var decimals = Math.Clamp((int)Math.Ceiling(-Math.Log10(step) - 1e-9), 0, 6);
        return (value == 0 ? 0 : value).ToString("F" + decimals, System.Globalization.CultureInfo.InvariantCulture);
    }
}
