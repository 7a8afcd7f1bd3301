namespace Partwise.Storage.Screenings;

/// <summary>
/// Screening results, idempotent on (baseline id, sample id). Each call's writes have committed durably before the
/// returned task completes, a flagged entry's flag in the same commit. Concurrent calls may share one commit (group
/// commit), each with the outcome it would have had in a transaction of its own.
/// </summary>
public interface IScreeningStore
{
    /// <summary>Records one screening; the same as <see cref="RecordBatchAsync"/> with one entry.</summary>
    /// <exception cref="ArgumentException">The entry is malformed (blank id or fingerprint, empty JSON, a distance or p-value out of range).</exception>
    /// <exception cref="StorageUnavailableException">The database cannot be reached; nothing was stored.</exception>
    Task<ScreeningBatchResult> RecordAsync(string baselineId, ScreeningEntry entry, CancellationToken cancellationToken);

    /// <summary>
    /// Records the entries against the baseline, all or nothing. A new (baseline, sample id) is stored, with a
    /// flag (status open) when <see cref="ScreeningEntry.Flag"/> is set; one already stored with the same fingerprint
    /// is a duplicate and returns the stored screening; one stored with another fingerprint is a conflict, and then
    /// nothing of the call is stored. A sample id repeated within the call is treated as if posted twice. The
    /// baseline must exist and be active, checked in the transaction that writes the call. Entries are written in ordinal order of
    /// sample id (so concurrent overlapping batches cannot deadlock), hence the flags of one call follow that order;
    /// the outcomes keep the order given.
    /// </summary>
    /// <exception cref="ArgumentException">No entries, or a malformed one.</exception>
    /// <exception cref="StorageUnavailableException">The database cannot be reached; nothing was stored.</exception>
    Task<ScreeningBatchResult> RecordBatchAsync(string baselineId, IReadOnlyList<ScreeningEntry> entries, CancellationToken cancellationToken);

    /// <summary>The stored screening of the sample against the baseline, or null.</summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<StoredScreening?> GetAsync(string baselineId, string sampleId, CancellationToken cancellationToken);
}
