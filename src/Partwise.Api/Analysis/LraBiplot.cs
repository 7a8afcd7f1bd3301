using System.Globalization;
using Partwise.Api.Pictures;

namespace Partwise.Api.Analysis;

/// <summary>
/// The biplot of dimensions 1 and 2 of a log-ratio analysis (Greenacre &amp; Lewi 2009): samples as points at their
/// principal coordinates, parts as arrows from the origin at their standard coordinates times one factor that fits
/// them to the samples. Both axes share one scale, so distances and angles read true.
/// </summary>
public static class LraBiplot
{
    private const double Width = 720;
    private const double Height = 600;
    private const double Left = 80, Right = 690, Top = 56, Bottom = 530;

    /// <summary>The SVG document for <paramref name="result"/>, which must have at least two dimensions.</summary>
    public static string Render(LraResponse result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var rows = result.Rows.Principal;
        var parts = result.Parts.Standard;
        var names = result.Parts.Names;

        // Arrows get one factor: their longest reaches 90% of the farthest sample (common practice for form biplots).
        double sampleReach = rows.Select(r => Math.Sqrt((r[0] * r[0]) + (r[1] * r[1]))).DefaultIfEmpty(0).Max();
        double partReach = parts.Select(r => Math.Sqrt((r[0] * r[0]) + (r[1] * r[1]))).DefaultIfEmpty(0).Max();
        var factor = partReach > 0 && sampleReach > 0 ? 0.9 * sampleReach / partReach : 1.0;

        var xs = rows.Select(r => r[0]).Concat(parts.Select(p => p[0] * factor)).Append(0).ToArray();
        var ys = rows.Select(r => r[1]).Concat(parts.Select(p => p[1] * factor)).Append(0).ToArray();
        double xMin = xs.Min(), xMax = xs.Max(), yMin = ys.Min(), yMax = ys.Max();
        double padX = Math.Max((xMax - xMin) * 0.08, 1e-9), padY = Math.Max((yMax - yMin) * 0.08, 1e-9);
        xMin -= padX;
        xMax += padX;
        yMin -= padY;
        yMax += padY;
        var scale = Math.Min((Right - Left) / (xMax - xMin), (Bottom - Top) / (yMax - yMin));

        // Centre the data in the plot area; the spare room on the longer side widens that axis's range.
        double xMid = (xMin + xMax) / 2, yMid = (yMin + yMax) / 2;
        double halfX = (Right - Left) / 2 / scale, halfY = (Bottom - Top) / 2 / scale;
        xMin = xMid - halfX;
        xMax = xMid + halfX;
        yMin = yMid - halfY;
        yMax = yMid + halfY;
        double X(double v) => Left + ((v - xMin) * scale);
        double Y(double v) => Bottom - ((v - yMin) * scale);

        var axis1 = AxisTitle(1, result.Inertia[0]);
        var axis2 = AxisTitle(2, result.Inertia[1]);
        var description = string.Create(
            CultureInfo.InvariantCulture,
            $"Log-ratio analysis biplot of {rows.Length} samples and {names.Count} parts. {axis1}; {axis2}. " +
            $"Points are samples at their principal coordinates; arrows are parts at their standard coordinates times {factor:G4}.");
        var svg = new SvgCanvas(Width, Height, "Log-ratio analysis biplot", description);
        svg.ArrowMarker("part-arrow");
        svg.Text(Left, 30, "Log-ratio analysis biplot", "title");

        svg.BeginGroup("axes");
        var xTicks = Ticks.Between(xMin, xMax);
        var yTicks = Ticks.Between(yMin, yMax);
        foreach (var t in xTicks)
        {
            svg.Line(X(t), Bottom, X(t), Bottom + 5, "tick");
            svg.Text(X(t), Bottom + 19, Ticks.Label(t, xTicks), null, "middle");
        }

        foreach (var t in yTicks)
        {
            svg.Line(Left - 5, Y(t), Left, Y(t), "tick");
            svg.Text(Left - 8, Y(t) + 4, Ticks.Label(t, yTicks), null, "end");
        }

        svg.Line(X(0), Top, X(0), Bottom, "origin");
        svg.Line(Left, Y(0), Right, Y(0), "origin");
        svg.Rect(Left, Top, Right - Left, Bottom - Top, "frame");
        svg.Text((Left + Right) / 2, Bottom + 44, axis1, "axis-title", "middle");
        svg.Text(Left - 52, (Top + Bottom) / 2, axis2, "axis-title", "middle", -90);
        svg.EndGroup();

        svg.BeginGroup("samples", "Samples");
        var ids = result.Rows.Ids;
        for (var i = 0; i < rows.Length; i++)
        {
            var name = ids?[i] ?? "sample " + i.ToString(CultureInfo.InvariantCulture);
            svg.Circle(X(rows[i][0]), Y(rows[i][1]), 3.5, "sample", string.Create(CultureInfo.InvariantCulture, $"{name} ({rows[i][0]:0.###}, {rows[i][1]:0.###})"));
        }

        svg.EndGroup();

        svg.BeginGroup("parts", "Parts");
        for (var j = 0; j < names.Count; j++)
        {
            double px = parts[j][0] * factor, py = parts[j][1] * factor;
            svg.BeginGroup("part-item");
            svg.Line(X(0), Y(0), X(px), Y(py), "part", "part-arrow", names[j]);
            var length = Math.Sqrt((px * px) + (py * py));
            double ux = length > 0 ? px / length : 0, uy = length > 0 ? py / length : 0;
            var anchor = ux > 0.3 ? "start" : ux < -0.3 ? "end" : "middle";
            svg.Text(X(px) + (ux * 8), Y(py) - (uy * 8) + 4, names[j], "part-label", anchor);
            svg.EndGroup();
        }

        svg.EndGroup();
        svg.Text(Left, Height - 12, string.Create(CultureInfo.InvariantCulture, $"Arrows: part standard coordinates × {factor:G3}."), "note");
        return svg.ToString();
    }

    /// <summary>"Dimension k (p%)" with the inertia in percent to one decimal.</summary>
    public static string AxisTitle(int dimension, double inertia) =>
        string.Create(CultureInfo.InvariantCulture, $"Dimension {dimension} ({inertia * 100:0.0}%)");
}
