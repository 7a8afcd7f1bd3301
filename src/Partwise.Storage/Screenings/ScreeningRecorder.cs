using Partwise.Storage.Database;
using Partwise.Storage.Flags;

namespace Partwise.Storage.Screenings;

/// <summary>Records one recording call's entries inside the writer's open transaction.</summary>
internal static class ScreeningRecorder
{
    /// <summary>
    /// Records the entries of one call against an active baseline (its status already checked in this transaction):
    /// a new (baseline, sample id) is inserted, with its flag when flagged; one stored with the same fingerprint is a
    /// duplicate; one with another fingerprint is a conflict, and then the call's own writes are undone, back to the
    /// savepoint taken when <paramref name="ownSavepoint"/> is set (a call of several entries; a call of one entry
    /// has written nothing when it conflicts). Entries are written in ordinal order of sample id, so that two
    /// transactions writing overlapping samples lock them in the same order; the outcomes keep the order given.
    /// The change counter's lock must already be held when any entry is flagged.
    /// </summary>
    /// <returns>The call's result and its last change token (null when it raised no flag or was undone).</returns>
    public static async Task<(ScreeningBatchResult Result, ChangeToken? Token)> RecordAsync(
        ScreeningStatements statements,
        DateTimeOffset screenedAt,
        string baselineId,
        IReadOnlyList<ScreeningEntry> entries,
        bool ownSavepoint,
        CancellationToken ct)
    {
        if (ownSavepoint)
        {
            await statements.SavepointAsync(ct);
        }

        var order = Enumerable.Range(0, entries.Count).OrderBy(i => entries[i].SampleId, StringComparer.Ordinal).ToList();
        var outcomes = new ScreeningOutcome[entries.Count];
        var recordedHere = new HashSet<string>(StringComparer.Ordinal);
        var conflict = false;
        ChangeToken? token = null;
        foreach (var index in order)
        {
            var entry = entries[index];
            var flagId = entry.Flag is null ? null : StoreIds.New();
            var observedAt = FlagRows.WriteObservedAt(entry.ObservedAt);
            if (await statements.TryInsertAsync(baselineId, entry, observedAt, screenedAt, flagId, ct))
            {
                if (entry.Flag is { } raised)
                {
                    token = await statements.BumpAsync(ct);
                    await statements.InsertFlagAsync(token.Value.Counter, flagId!, baselineId, entry, raised, observedAt, screenedAt, ct);
                }

                var stored = new StoredScreening(entry.SampleId, entry.Fingerprint, entry.ResultJson, screenedAt, flagId, entry.ObservedAt, entry.Source);
                outcomes[index] = new ScreeningOutcome(ScreeningOutcomeKind.Recorded, entry.SampleId, stored);
                recordedHere.Add(entry.SampleId);
                continue;
            }

            var existing = await statements.ReadAsync(baselineId, entry.SampleId, ct)
                ?? throw new InvalidOperationException("A screening that blocked an insert is not there to read.");
            var same = string.Equals(existing.Fingerprint, entry.Fingerprint, StringComparison.Ordinal);
            conflict |= !same;
            outcomes[index] = same
                ? new ScreeningOutcome(ScreeningOutcomeKind.Duplicate, entry.SampleId, existing)
                : new ScreeningOutcome(ScreeningOutcomeKind.Conflict, entry.SampleId, null);
        }

        if (conflict)
        {
            if (ownSavepoint)
            {
                await statements.RollbackToSavepointAsync(ct);
            }

            // Undone: what this call recorded, and duplicates of it within the call, are not stored after all.
            var undone = outcomes
                .Select(o => o.Kind == ScreeningOutcomeKind.Recorded || (o.Kind == ScreeningOutcomeKind.Duplicate && recordedHere.Contains(o.SampleId))
                    ? o with { Kind = ScreeningOutcomeKind.NotRecorded, Stored = null }
                    : o)
                .ToList();
            return (new ScreeningBatchResult(ScreeningBatchStatus.Conflict, undone), null);
        }

        if (ownSavepoint)
        {
            await statements.ReleaseAsync(ct);
        }

        return (new ScreeningBatchResult(ScreeningBatchStatus.Committed, outcomes), token);
    }
}
