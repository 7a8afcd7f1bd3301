namespace Partwise.Storage.Flags;

/// <summary>The wire names of <see cref="FlagStatus"/> and <see cref="FlagStatusFilter"/> (lowercase, as stored).</summary>
public static class FlagStatusNames
{
    /// <summary>The name of an open flag.</summary>
    public const string Open = "open";

    /// <summary>The name of a confirmed flag.</summary>
    public const string Confirmed = "confirmed";

    /// <summary>The name of a dismissed flag.</summary>
    public const string Dismissed = "dismissed";

    /// <summary>The filter that matches every flag.</summary>
    public const string Any = "any";

    /// <summary>The wire name of <paramref name="status"/>.</summary>
    public static string ToName(FlagStatus status) => status switch
    {
        FlagStatus.Open => Open,
        FlagStatus.Confirmed => Confirmed,
        FlagStatus.Dismissed => Dismissed,
        _ => throw new ArgumentOutOfRangeException(nameof(status), status, "not a flag status"),
    };

    /// <summary>Reads a wire name (exact, lowercase); false for anything else.</summary>
    public static bool TryParseStatus(string? name, out FlagStatus status)
    {
        (var ok, status) = name switch
        {
            Open => (true, FlagStatus.Open),
            Confirmed => (true, FlagStatus.Confirmed),
            Dismissed => (true, FlagStatus.Dismissed),
            _ => (false, FlagStatus.Open),
        };
        return ok;
    }

    /// <summary>Reads a filter's wire name (exact, lowercase: open, confirmed, dismissed, any); false for anything else.</summary>
    public static bool TryParseFilter(string? name, out FlagStatusFilter filter)
    {
        (var ok, filter) = name switch
        {
            Open => (true, FlagStatusFilter.Open),
            Confirmed => (true, FlagStatusFilter.Confirmed),
            Dismissed => (true, FlagStatusFilter.Dismissed),
            Any => (true, FlagStatusFilter.Any),
            _ => (false, FlagStatusFilter.Open),
        };
        return ok;
    }
}
