using System.Globalization;
using System.Text;
using System.Text.Json;

namespace Partwise.Demo;

/// <summary>
/// A small JSON tree for the demo bodies with a fixed layout: short arrays of numbers or strings on one line (a
/// table row), longer ones and anything nested one element per line. Numbers are written with the invariant
/// culture in their shortest round-trip form, so the files are the same on every machine.
/// </summary>
internal abstract record DemoJson
{
    private const int InlineWidth = 100;

    /// <summary>A number.</summary>
    public static DemoJson Of(double value) => new Number(value);

    /// <summary>A string.</summary>
    public static DemoJson Of(string value) => new Text(value);

    /// <summary>An array.</summary>
    public static DemoJson List(IEnumerable<DemoJson> items) => new Items([.. items]);

    /// <summary>An array of numbers.</summary>
    public static DemoJson List(IEnumerable<double> items) => new Items([.. items.Select(Of)]);

    /// <summary>An array of strings.</summary>
    public static DemoJson List(IEnumerable<string> items) => new Items([.. items.Select(Of)]);

    /// <summary>An object with members in the given order.</summary>
    public static DemoJson Map(params (string Key, DemoJson Value)[] members) => new Members(members);

    /// <summary>The document, ending with a newline.</summary>
    public string Render()
    {
        var sb = new StringBuilder();
        Write(sb, 0);
        return sb.Append('\n').ToString();
    }

    /// <summary>Formats a number as the files write it.</summary>
    public static string FormatNumber(double value) =>
        double.IsFinite(value) ? value.ToString("R", CultureInfo.InvariantCulture) : throw new ArgumentOutOfRangeException(nameof(value), value, "Only finite numbers are written.");

    protected abstract void Write(StringBuilder sb, int indent);

    protected virtual string? Inline() => null;

    private sealed record Number(double Value) : DemoJson
    {
        protected override void Write(StringBuilder sb, int indent) => sb.Append(Inline());

        protected override string Inline() => FormatNumber(Value);
    }

    private sealed record Text(string Value) : DemoJson
    {
        protected override void Write(StringBuilder sb, int indent) => sb.Append(Inline());

        protected override string Inline() => JsonSerializer.Serialize(Value);
    }

    private sealed record Items(DemoJson[] Elements) : DemoJson
    {
        protected override string? Inline()
        {
            if (Elements.Any(e => e is not (Number or Text)))
            {
                return null;
            }

            var text = "[" + string.Join(", ", Elements.Select(e => e.Inline())) + "]";
            return text.Length <= InlineWidth ? text : null;
        }

        protected override void Write(StringBuilder sb, int indent)
        {
            if (Inline() is { } inline)
            {
                sb.Append(inline);
                return;
            }

            sb.Append("[\n");
            for (var i = 0; i < Elements.Length; i++)
            {
                sb.Append(' ', indent + 2);
                Elements[i].Write(sb, indent + 2);
                sb.Append(i + 1 < Elements.Length ? ",\n" : "\n");
            }

            sb.Append(' ', indent).Append(']');
        }
    }

    private sealed record Members((string Key, DemoJson Value)[] Pairs) : DemoJson
    {
        protected override string? Inline()
        {
            var parts = Pairs.Select(p => p.Value.Inline() is { } v ? $"{JsonSerializer.Serialize(p.Key)}: {v}" : null).ToArray();
            if (parts.Any(p => p is null))
            {
                return null;
            }

            var text = "{ " + string.Join(", ", parts) + " }";
            return text.Length <= InlineWidth ? text : null;
        }

        protected override void Write(StringBuilder sb, int indent)
        {
            if (indent > 0 && Inline() is { } inline)
            {
                sb.Append(inline);
                return;
            }

            sb.Append("{\n");
            for (var i = 0; i < Pairs.Length; i++)
            {
                sb.Append(' ', indent + 2).Append(JsonSerializer.Serialize(Pairs[i].Key)).Append(": ");
                Pairs[i].Value.Write(sb, indent + 2);
                sb.Append(i + 1 < Pairs.Length ? ",\n" : "\n");
            }

            sb.Append(' ', indent).Append('}');
        }
    }
}
