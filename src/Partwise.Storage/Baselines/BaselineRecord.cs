namespace Partwise.Storage.Baselines;

/// <summary>What the store assigns to a new baseline, handed to the caller to render the document with.</summary>
/// <param name="Id">Opaque, unique, never reused.</param>
/// <param name="Name">The name the baseline was created under.</param>
/// <param name="Version">1 for the first baseline under <paramref name="Name"/>, then n + 1 for each refit.</param>
/// <param name="CreatedAt">The store's clock, UTC, to the microsecond.</param>
public sealed record BaselineStamp(string Id, string Name, int Version, DateTimeOffset CreatedAt);

/// <summary>A stored baseline: immutable apart from retirement.</summary>
/// <param name="Id">Opaque, unique, never reused.</param>
/// <param name="Name">The name it was created under.</param>
/// <param name="Version">Its version under <paramref name="Name"/>, from 1.</param>
/// <param name="CreatedAt">When it was created (UTC, microseconds).</param>
/// <param name="RetiredAt">When it was first retired, or null while active.</param>
/// <param name="DocumentJson">The document exactly as rendered at creation.</param>
public sealed record BaselineRecord(
    string Id,
    string Name,
    int Version,
    DateTimeOffset CreatedAt,
    DateTimeOffset? RetiredAt,
    string DocumentJson)
{
    /// <summary>True once the baseline has been retired; screening it is then refused.</summary>
    public bool IsRetired => RetiredAt is not null;
}
