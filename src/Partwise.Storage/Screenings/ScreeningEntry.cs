namespace Partwise.Storage.Screenings;

/// <summary>One screened sample to record.</summary>
/// <param name="SampleId">The caller's id of the sample; unique per baseline.</param>
/// <param name="Fingerprint">
/// Identifies the sample's values (see <see cref="SampleFingerprint.Compute"/>): the same id posted again with the
/// same fingerprint is a duplicate, with another fingerprint a conflict.
/// </param>
/// <param name="ResultJson">
/// The screening result as the host reports it, without the fields the store supplies (the flag id, the duplicate
/// marker); stored as given and returned unchanged for duplicates.
/// </param>
/// <param name="ObservedAt">When the sample was taken, as the caller said (its offset is kept), or null.</param>
/// <param name="Source">Where the sample came from (a well, an instrument), or null.</param>
/// <param name="Flag">The flag to raise, or null when the sample is not flagged.</param>
public sealed record ScreeningEntry(
    string SampleId,
    string Fingerprint,
    string ResultJson,
    DateTimeOffset? ObservedAt,
    string? Source,
    ScreeningFlag? Flag);

/// <summary>What a flag records of a flagged sample besides its id, baseline and times.</summary>
/// <param name="Distance">The Mahalanobis distance; finite and non-negative.</param>
/// <param name="PValue">The p-value, in [0, 1].</param>
/// <param name="ReasonsJson">The reasons as a JSON array, stored as given.</param>
/// <param name="ValuesJson">The sample's values as sent (a JSON object from part name to value), stored as given, or null.</param>
public sealed record ScreeningFlag(double Distance, double PValue, string ReasonsJson, string? ValuesJson = null);
