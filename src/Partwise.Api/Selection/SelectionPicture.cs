using System.Globalization;
using Partwise.Api.Pictures;

namespace Partwise.Api.Selection;

/// <summary>
/// The picture of a ratio selection: on the left the graph of the chosen ratios (nodes on a circle, an arrow from each
/// ratio's numerator to its denominator labelled with its step number), on the right the cumulative explained
/// fraction by step.
/// </summary>
public static class SelectionPicture
{
    private const double Width = 960;
    private const double Height = 460;

    /// <summary>The SVG document for <paramref name="result"/>.</summary>
    public static string Render(RatioSelectionResponse result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var steps = result.Steps;
        var last = steps.Count == 0 ? 0 : steps[^1].Explained;
        var stepText = string.Join("; ", steps.Select((s, i) => FormattableString.Invariant($"{i + 1} {s.Label} {s.Explained:0.000}")));
        var description = FormattableString.Invariant(
            $"Left: the graph of the {steps.Count} chosen ratio(s) over {result.Graph.Nodes.Count} node(s), an arrow from numerator to denominator labelled with its step. Right: the cumulative fraction of the total log-ratio variance explained after each step, reaching {last:0.000}. Steps: {stepText}.");
        var svg = new SvgCanvas(Width, Height, "Stepwise ratio selection", description);
        svg.ArrowMarker("edge-arrow");
        svg.Text(20, 28, "Chosen ratios", "title");
        svg.Text(500, 28, "Cumulative explained variance", "title");
        DrawGraph(svg, result);
        DrawCurve(svg, steps);
        return svg.ToString();
    }

    private static void DrawGraph(SvgCanvas svg, RatioSelectionResponse result)
    {
        const double cx = 230, cy = 250, radius = 160;

        // Each node is wide enough for its name (about 7 units per character at 12px).
        var nodeRadius = Math.Max(22, (3.6 * result.Graph.Nodes.DefaultIfEmpty("").Max(n => n!.Length)) + 6);
        var nodes = result.Graph.Nodes;
        var place = new Dictionary<string, (double X, double Y)>(StringComparer.Ordinal);
        for (var k = 0; k < nodes.Count; k++)
        {
            // Clockwise from the top, so the first-used node sits at twelve o'clock.
            var angle = (2 * Math.PI * k / Math.Max(nodes.Count, 1)) - (Math.PI / 2);
            place[nodes[k]] = (cx + (radius * Math.Cos(angle)), cy + (radius * Math.Sin(angle)));
        }

        svg.BeginGroup("edges", "Ratios, from numerator to denominator");
        var edges = result.Graph.Edges;
        for (var e = 0; e < edges.Count; e++)
        {
            var (x1, y1) = place[edges[e].From];
            var (x2, y2) = place[edges[e].To];
            var length = Math.Max(Math.Sqrt(((x2 - x1) * (x2 - x1)) + ((y2 - y1) * (y2 - y1))), 1e-9);
            double ux = (x2 - x1) / length, uy = (y2 - y1) / length;
            svg.BeginGroup("edge-item");
            svg.Line(x1 + (ux * nodeRadius), y1 + (uy * nodeRadius), x2 - (ux * (nodeRadius + 2)), y2 - (uy * (nodeRadius + 2)), "edge", "edge-arrow",
                string.Create(CultureInfo.InvariantCulture, $"Step {e + 1}: {edges[e].Label}"));

            // The step number sits beside the middle of the arrow, off the line.
            double mx = ((x1 + x2) / 2) - (uy * 10), my = ((y1 + y2) / 2) + (ux * 10) + 4;
            svg.Text(mx, my, (e + 1).ToString(CultureInfo.InvariantCulture), "edge-label", "middle");
            svg.EndGroup();
        }

        svg.EndGroup();
        svg.BeginGroup("nodes", "Parts and amalgamations");
        foreach (var node in nodes)
        {
            var (x, y) = place[node];
            svg.Circle(x, y, nodeRadius, "node", node);
            svg.Text(x, y + 4, node, "node-label", "middle");
        }

        svg.EndGroup();
        svg.Text(20, Height - 16, result.Graph.Acyclic && result.Graph.Connected ? "The ratios form a tree." : "The ratios do not form a tree.", "note");
    }

    private static void DrawCurve(SvgCanvas svg, IReadOnlyList<SelectionStepItem> steps)
    {
        const double left = 560, right = 930, top = 60, bottom = 390;
        var count = Math.Max(steps.Count, 1);
        double X(double step) => left + ((right - left) * (count == 1 ? 0.5 : (step - 1) / (count - 1)));
        double Y(double fraction) => bottom - ((bottom - top) * fraction);

        svg.BeginGroup("axes");
        foreach (var t in new[] { 0.0, 0.25, 0.5, 0.75, 1.0 })
        {
            svg.Line(left, Y(t), right, Y(t), "grid");
            svg.Line(left - 5, Y(t), left, Y(t), "tick");
            svg.Text(left - 8, Y(t) + 4, t.ToString("0.00", CultureInfo.InvariantCulture), null, "end");
        }

        for (var s = 1; s <= steps.Count; s++)
        {
            svg.Line(X(s), bottom, X(s), bottom + 5, "tick");
            svg.Text(X(s), bottom + 19, s.ToString(CultureInfo.InvariantCulture), null, "middle");
        }

        svg.Rect(left, top, right - left, bottom - top, "frame");
        svg.Text((left + right) / 2, bottom + 42, "Step", "axis-title", "middle");
        svg.Text(left - 46, (top + bottom) / 2, "Explained fraction (cumulative)", "axis-title", "middle", -90);
        svg.EndGroup();

        svg.BeginGroup("curve-group", "Cumulative explained fraction by step");
        svg.Polyline(steps.Select((s, i) => (X(i + 1), Y(s.Explained))), "curve");
        for (var i = 0; i < steps.Count; i++)
        {
            svg.Circle(X(i + 1), Y(steps[i].Explained), 4.5, "step",
                string.Create(CultureInfo.InvariantCulture, $"Step {i + 1}: {steps[i].Label}, explained {steps[i].Explained:0.0000}"));
        }

        svg.EndGroup();
    }
}
