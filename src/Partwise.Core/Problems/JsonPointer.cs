namespace Partwise.Core.Problems;

/// <summary>RFC 6901 JSON pointer helpers for building the pointers that problems carry.</summary>
public static class JsonPointer
{
    /// <summary>Escapes one reference token: <c>~</c> becomes <c>~0</c> and <c>/</c> becomes <c>~1</c> (RFC 6901 §3).</summary>
    public static string Escape(string token)
    {
        ArgumentNullException.ThrowIfNull(token);
        return token.Replace("~", "~0", StringComparison.Ordinal).Replace("/", "~1", StringComparison.Ordinal);
    }
}
