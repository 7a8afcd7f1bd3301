namespace Partwise.Storage.Screenings;

/// <summary>A screening as stored.</summary>
/// <param name="SampleId">The caller's id of the sample.</param>
/// <param name="Fingerprint">The fingerprint of its values.</param>
/// <param name="ResultJson">The result exactly as first recorded.</param>
/// <param name="ScreenedAt">When it was first recorded (the store's clock, UTC, microseconds).</param>
/// <param name="FlagId">The id of the flag it raised, or null.</param>
/// <param name="ObservedAt">When the sample was taken, or null.</param>
/// <param name="Source">Where it came from, or null.</param>
public sealed record StoredScreening(
    string SampleId,
    string Fingerprint,
    string ResultJson,
    DateTimeOffset ScreenedAt,
    string? FlagId,
    DateTimeOffset? ObservedAt,
    string? Source);

/// <summary>What happened to one entry of a recording call.</summary>
public enum ScreeningOutcomeKind
{
    /// <summary>Stored now (with its flag, if flagged).</summary>
    Recorded,

    /// <summary>Already stored with the same fingerprint; <see cref="ScreeningOutcome.Stored"/> is the earlier record.</summary>
    Duplicate,

    /// <summary>Already stored with another fingerprint: the same sample id with other values (the host answers 409).</summary>
    Conflict,

    /// <summary>New and valid, but not stored because another entry of the same call was a conflict.</summary>
    NotRecorded,
}

/// <summary>The outcome for one entry, in the order the entries were given.</summary>
/// <param name="Kind">What happened.</param>
/// <param name="SampleId">The entry's sample id.</param>
/// <param name="Stored">The stored screening for <see cref="ScreeningOutcomeKind.Recorded"/> and <see cref="ScreeningOutcomeKind.Duplicate"/>, else null.</param>
public sealed record ScreeningOutcome(ScreeningOutcomeKind Kind, string SampleId, StoredScreening? Stored);

/// <summary>How a recording call ended as a whole.</summary>
public enum ScreeningBatchStatus
{
    /// <summary>Committed: every entry is <see cref="ScreeningOutcomeKind.Recorded"/> or <see cref="ScreeningOutcomeKind.Duplicate"/>, durably.</summary>
    Committed,

    /// <summary>At least one entry conflicts; the transaction was rolled back and nothing of this call was stored.</summary>
    Conflict,

    /// <summary>No baseline has the id; nothing was stored and there are no outcomes.</summary>
    BaselineNotFound,

    /// <summary>The baseline is retired (the host answers 410); nothing was stored and there are no outcomes.</summary>
    BaselineRetired,
}

/// <summary>The result of recording one or more screenings in one transaction.</summary>
/// <param name="Status">How the call ended.</param>
/// <param name="Outcomes">One per entry, in order (empty when the baseline is missing or retired).</param>
public sealed record ScreeningBatchResult(ScreeningBatchStatus Status, IReadOnlyList<ScreeningOutcome> Outcomes);
