using System.Globalization;
using Partwise.Api.Pictures;

namespace Partwise.Api.Analysis;

/// <summary>
/// The biplot of dimensions 1 and 2 of a log-ratio analysis (Greenacre &amp; Lewi 2009): samples as points at their
/// principal coordinates, parts as arrows from the origin in the directions of their standard coordinates, drawn at
/// their contribution coordinates √w_j × standard (Greenacre 2013, J. Comput. Graph. Stat. 22:107-122, from memory) times
/// one factor that fits them to the samples, so that rare parts with large standard coordinates do not swamp the
/// picture. Both axes share one scale, so distances and angles read true.
/// </summary>
public static class LraBiplot
{
    private const double Width = 720;
    private const double Left = 80, Right = 690, Top = 56;

    /// <summary>The SVG document for <paramref name="result"/>, which must have at least two dimensions.</summary>
    public static string Render(LraResponse result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var rows = result.Rows.Principal;
        var names = result.Parts.Names;
        var parts = result.Parts.Standard.Select((p, j) => new[] { p[0] * Math.Sqrt(result.Weights[j]), p[1] * Math.Sqrt(result.Weights[j]) }).ToArray();

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
        // The plot's height follows the data's aspect (within limits), so that one scale serves both axes without waste.
        var plotHeight = Math.Clamp((Right - Left) * (yMax - yMin) / (xMax - xMin), 280, 560);
        var bottom = Top + plotHeight;
        var height = bottom + 72;
        var scale = Math.Min((Right - Left) / (xMax - xMin), plotHeight / (yMax - yMin));

        // Centre the data in the plot area; the spare room on the longer side widens that axis's range.
        double xMid = (xMin + xMax) / 2, yMid = (yMin + yMax) / 2;
        double halfX = (Right - Left) / 2 / scale, halfY = plotHeight / 2 / scale;
        xMin = xMid - halfX;
        xMax = xMid + halfX;
        yMin = yMid - halfY;
        yMax = yMid + halfY;
        double X(double v) => Left + ((v - xMin) * scale);
        double Y(double v) => bottom - ((v - yMin) * scale);

        var axis1 = AxisTitle(1, result.Inertia[0]);
        var axis2 = AxisTitle(2, result.Inertia[1]);
        var description = string.Create(
            CultureInfo.InvariantCulture,
            $"Log-ratio analysis biplot of {rows.Length} samples and {names.Count} parts. {axis1}; {axis2}. " +
            $"Points are samples at their principal coordinates; arrows are parts in the directions of their standard coordinates, at their contribution coordinates (square root of the part weight times standard) times {factor:G4}.");
        var svg = new SvgCanvas(Width, height, "Log-ratio analysis biplot", description);
        svg.ArrowMarker("part-arrow");
        svg.Text(Left, 30, "Log-ratio analysis biplot", "title");

        svg.BeginGroup("axes");
        var xTicks = Ticks.Between(xMin, xMax);
        var yTicks = Ticks.Between(yMin, yMax);
        foreach (var t in xTicks)
        {
            svg.Line(X(t), bottom, X(t), bottom + 5, "tick");
            svg.Text(X(t), bottom + 19, Ticks.Label(t, xTicks), null, "middle");
        }

        foreach (var t in yTicks)
        {
            svg.Line(Left - 5, Y(t), Left, Y(t), "tick");
            svg.Text(Left - 8, Y(t) + 4, Ticks.Label(t, yTicks), null, "end");
        }

        svg.Line(X(0), Top, X(0), bottom, "origin");
        svg.Line(Left, Y(0), Right, Y(0), "origin");
        svg.Rect(Left, Top, Right - Left, bottom - Top, "frame");
        svg.Text((Left + Right) / 2, bottom + 44, axis1, "axis-title", "middle");
        svg.Text(Left - 52, (Top + bottom) / 2, axis2, "axis-title", "middle", -90);
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
        svg.Text(Left, height - 12, string.Create(CultureInfo.InvariantCulture, $"Arrows: part contribution coordinates √w × standard, × {factor:G3}."), "note");
        return svg.ToString();
    }

    /// <summary>"Dimension k (p%)" with the inertia in percent to one decimal.</summary>
    public static string AxisTitle(int dimension, double inertia) =>
        string.Create(CultureInfo.InvariantCulture, $"Dimension {dimension} ({inertia * 100:0.0}%)");
}
