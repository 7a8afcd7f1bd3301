namespace Partwise.Storage.Flags;

/// <summary>The review state of a flag. On the wire: <c>open</c>, <c>confirmed</c>, <c>dismissed</c>.</summary>
public enum FlagStatus
{
    /// <summary>Raised, not yet reviewed.</summary>
    Open,

    /// <summary>An analyst judged the signal real.</summary>
    Confirmed,

    /// <summary>An analyst judged the signal not to matter.</summary>
    Dismissed,
}

/// <summary>Which flags a listing returns. On the wire: <c>open</c> (the host's default), <c>confirmed</c>, <c>dismissed</c>, <c>any</c>.</summary>
public enum FlagStatusFilter
{
    /// <summary>Open flags only.</summary>
    Open,

    /// <summary>Confirmed flags only.</summary>
    Confirmed,

    /// <summary>Dismissed flags only.</summary>
    Dismissed,

    /// <summary>Every flag.</summary>
    Any,
}

/// <summary>The latest review of a flag.</summary>
/// <param name="Status">Confirmed or dismissed.</param>
/// <param name="Note">The reviewer's note, or null.</param>
/// <param name="Reviewer">Who reviewed, or null.</param>
/// <param name="ReviewedAt">When (the store's clock, UTC, microseconds).</param>
public sealed record FlagReview(FlagStatus Status, string? Note, string? Reviewer, DateTimeOffset ReviewedAt);

/// <summary>A flag: a statistical signal raised by a screening, for a qualified analyst to review.</summary>
/// <param name="Id">Opaque, unique.</param>
/// <param name="Sequence">Its position in the store's commit order: increasing, not dense; what cursors encode.</param>
/// <param name="BaselineId">The baseline the sample was screened against.</param>
/// <param name="SampleId">The caller's id of the sample.</param>
/// <param name="ObservedAt">When the sample was taken, as the caller said, or null.</param>
/// <param name="Source">Where it came from, or null.</param>
/// <param name="ScreenedAt">When the screening was recorded.</param>
/// <param name="Distance">The Mahalanobis distance.</param>
/// <param name="PValue">The p-value.</param>
/// <param name="ReasonsJson">The reasons, a JSON array as given at screening.</param>
/// <param name="Status">Open until reviewed.</param>
/// <param name="Review">The latest review, or null while open.</param>
/// <param name="ValuesJson">The sample's values as sent (a JSON object from part name to value), or null for a flag raised before they were kept.</param>
public sealed record FlagRecord(
    string Id,
    long Sequence,
    string BaselineId,
    string SampleId,
    DateTimeOffset? ObservedAt,
    string? Source,
    DateTimeOffset ScreenedAt,
    double Distance,
    double PValue,
    string ReasonsJson,
    FlagStatus Status,
    FlagReview? Review,
    string? ValuesJson = null);
