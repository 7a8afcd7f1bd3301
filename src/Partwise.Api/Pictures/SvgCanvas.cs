using System.Globalization;
using System.Text;

namespace Partwise.Api.Pictures;

/// <summary>
/// Writes a small standalone SVG 1.1 document by hand: a <c>viewBox</c>, an accessible <c>&lt;title&gt;</c> and
/// <c>&lt;desc&gt;</c> (referenced by <c>aria-labelledby</c>), one style sheet with the service's palette, and
/// elements whose text and attributes are XML-escaped. Numbers are written in invariant culture with at most two
/// decimals, which is finer than any screen needs.
/// </summary>
public sealed class SvgCanvas
{
    /// <summary>The palette: muted ink, a blue for samples and curves, a rust red for parts and edges.</summary>
    private const string Style =
        "text{font-family:'DejaVu Sans',Verdana,Arial,sans-serif;font-size:12px;fill:#222}" +
        ".title{font-size:15px;font-weight:bold}.axis-title{font-size:13px}.note{font-size:11px;fill:#555}" +
        ".frame{fill:none;stroke:#666;stroke-width:1}.tick{stroke:#666;stroke-width:1}.grid{stroke:#ddd;stroke-width:1}" +
        ".origin{stroke:#999;stroke-width:1;stroke-dasharray:4 3}" +
        ".sample{fill:#2f6f8f;fill-opacity:0.65;stroke:#1d4a61;stroke-width:0.5}" +
        ".part{stroke:#b0472b;stroke-width:1.6}.part-label{fill:#8a3320;font-weight:bold}" +
        ".node{fill:#f4efe6;stroke:#6b5b45;stroke-width:1.2}.node-label{font-size:12px}" +
        ".edge{stroke:#b0472b;stroke-width:1.6}.edge-label{fill:#8a3320;font-size:11px;font-weight:bold}" +
        ".curve{fill:none;stroke:#2f6f8f;stroke-width:2}.step{fill:#2f6f8f;stroke:#fff;stroke-width:1}" +
        ".arrow-head{fill:#b0472b}";

    private readonly StringBuilder _body = new();
    private readonly StringBuilder _defs = new();
    private readonly double _width;
    private readonly double _height;
    private readonly string _title;
    private readonly string _description;

    /// <summary>A canvas of <paramref name="width"/> × <paramref name="height"/> user units.</summary>
    /// <param name="width">Width of the viewBox.</param>
    /// <param name="height">Height of the viewBox.</param>
    /// <param name="title">The accessible name (the <c>&lt;title&gt;</c>).</param>
    /// <param name="description">The accessible description (the <c>&lt;desc&gt;</c>): what the picture shows, in words.</param>
    public SvgCanvas(double width, double height, string title, string description)
    {
        _width = width;
        _height = height;
        _title = title;
        _description = description;
    }

    /// <summary>An invariant-culture number with at most two decimals (−0 written as 0).</summary>
    public static string Number(double value)
    {
        var rounded = Math.Round(value, 2);
        return (rounded == 0 ? 0 : rounded).ToString("0.##", CultureInfo.InvariantCulture);
    }

    /// <summary>Escapes text for XML content and double-quoted attributes.</summary>
    public static string Escape(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var sb = new StringBuilder(text.Length);
        foreach (var c in text)
        {
            switch (c)
            {
                case '&': sb.Append("&amp;"); break;
                case '<': sb.Append("&lt;"); break;
                case '>': sb.Append("&gt;"); break;
                case '"': sb.Append("&quot;"); break;
                case '\'': sb.Append("&apos;"); break;
                default:
                    // Control characters other than tab, newline and return are not allowed in XML 1.0.
                    if (c >= ' ' || c == '\t' || c == '\n' || c == '\r')
                    {
                        sb.Append(c);
                    }

                    break;
            }
        }

        return sb.ToString();
    }

    /// <summary>Defines an arrow head marker <c>url(#id)</c> that points along the line it ends.</summary>
    public void ArrowMarker(string id)
    {
        _defs.Append("<marker id=\"").Append(Escape(id)).Append("\" viewBox=\"0 0 10 10\" refX=\"9\" refY=\"5\" markerWidth=\"7\" markerHeight=\"7\" orient=\"auto-start-reverse\">")
            .Append("<path class=\"arrow-head\" d=\"M0,0 L10,5 L0,10 z\"/></marker>");
    }

    /// <summary>Opens a group, with an accessible label when given.</summary>
    public void BeginGroup(string cssClass, string? label = null)
    {
        _body.Append("<g class=\"").Append(Escape(cssClass)).Append('"');
        if (label is not null)
        {
            _body.Append(" role=\"group\" aria-label=\"").Append(Escape(label)).Append('"');
        }

        _body.Append('>');
    }

    /// <summary>Closes the last group.</summary>
    public void EndGroup() => _body.Append("</g>");

    /// <summary>A line; <paramref name="marker"/> names an arrow head for its end.</summary>
    public void Line(double x1, double y1, double x2, double y2, string cssClass, string? marker = null, string? tooltip = null)
    {
        _body.Append("<line class=\"").Append(Escape(cssClass)).Append("\" x1=\"").Append(Number(x1)).Append("\" y1=\"").Append(Number(y1))
            .Append("\" x2=\"").Append(Number(x2)).Append("\" y2=\"").Append(Number(y2)).Append('"');
        if (marker is not null)
        {
            _body.Append(" marker-end=\"url(#").Append(Escape(marker)).Append(")\"");
        }

        Close("line", tooltip);
    }

    /// <summary>A circle, with a tooltip (<c>&lt;title&gt;</c> child) when given.</summary>
    public void Circle(double cx, double cy, double r, string cssClass, string? tooltip = null)
    {
        _body.Append("<circle class=\"").Append(Escape(cssClass)).Append("\" cx=\"").Append(Number(cx)).Append("\" cy=\"").Append(Number(cy))
            .Append("\" r=\"").Append(Number(r)).Append('"');
        Close("circle", tooltip);
    }

    /// <summary>A rectangle.</summary>
    public void Rect(double x, double y, double width, double height, string cssClass)
    {
        _body.Append("<rect class=\"").Append(Escape(cssClass)).Append("\" x=\"").Append(Number(x)).Append("\" y=\"").Append(Number(y))
            .Append("\" width=\"").Append(Number(width)).Append("\" height=\"").Append(Number(height)).Append("\"/>");
    }

    /// <summary>A polyline through <paramref name="points"/>.</summary>
    public void Polyline(IEnumerable<(double X, double Y)> points, string cssClass)
    {
        ArgumentNullException.ThrowIfNull(points);
        _body.Append("<polyline class=\"").Append(Escape(cssClass)).Append("\" points=\"")
            .AppendJoin(' ', points.Select(p => Number(p.X) + "," + Number(p.Y))).Append("\"/>");
    }

    /// <summary>Text at (x, y); <paramref name="anchor"/> is start, middle or end; <paramref name="rotate"/> in degrees about (x, y).</summary>
    public void Text(double x, double y, string text, string? cssClass = null, string anchor = "start", double rotate = 0)
    {
        ArgumentNullException.ThrowIfNull(text);
        _body.Append("<text x=\"").Append(Number(x)).Append("\" y=\"").Append(Number(y)).Append('"');
        if (cssClass is not null)
        {
            _body.Append(" class=\"").Append(Escape(cssClass)).Append('"');
        }

        if (anchor != "start")
        {
            _body.Append(" text-anchor=\"").Append(Escape(anchor)).Append('"');
        }

        if (rotate != 0)
        {
            _body.Append(" transform=\"rotate(").Append(Number(rotate)).Append(' ').Append(Number(x)).Append(' ').Append(Number(y)).Append(")\"");
        }

        _body.Append('>').Append(Escape(text)).Append("</text>");
    }

    /// <summary>The document.</summary>
    public override string ToString()
    {
        var svg = new StringBuilder(_body.Length + _defs.Length + 1024);
        svg.Append("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n")
            .Append("<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" viewBox=\"0 0 ").Append(Number(_width)).Append(' ').Append(Number(_height))
            .Append("\" width=\"").Append(Number(_width)).Append("\" height=\"").Append(Number(_height))
            .Append("\" role=\"img\" aria-labelledby=\"picture-title picture-desc\">\n")
            .Append("<title id=\"picture-title\">").Append(Escape(_title)).Append("</title>\n")
            .Append("<desc id=\"picture-desc\">").Append(Escape(_description)).Append("</desc>\n")
            .Append("<defs><style>").Append(Style).Append("</style>").Append(_defs).Append("</defs>\n")
            .Append("<rect x=\"0\" y=\"0\" width=\"").Append(Number(_width)).Append("\" height=\"").Append(Number(_height)).Append("\" fill=\"#fff\"/>\n")
            .Append(_body)
            .Append("\n</svg>\n");
        return svg.ToString();
    }

    private void Close(string element, string? tooltip)
    {
        if (tooltip is null)
        {
            _body.Append("/>");
            return;
        }

        _body.Append("><title>").Append(Escape(tooltip)).Append("</title></").Append(element).Append('>');
    }
}
