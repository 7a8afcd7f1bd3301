using System.Collections.Concurrent;
using Partwise.Storage.Baselines;

namespace Partwise.Api.Baselines;

/// <summary>
/// Rebuilt screening baselines by id. Documents never change once stored, so a rebuilt baseline stays valid; only
/// retirement changes, and the store checks that in the transaction of every recorded screening.
/// </summary>
public sealed class BaselineCache
{
    private const int MaxEntries = 1_000;
    private readonly ConcurrentDictionary<string, ScreeningBaseline> entries = new(StringComparer.Ordinal);

    /// <summary>The cached baseline, or null.</summary>
    public ScreeningBaseline? Find(string id) => entries.TryGetValue(id, out var baseline) ? baseline : null;

    /// <summary>Rebuilds the stored document and keeps it.</summary>
    public ScreeningBaseline Add(BaselineRecord record)
    {
        ArgumentNullException.ThrowIfNull(record);
        var baseline = BaselineReading.Rebuild(BaselineJson.Read<BaselineDocument>(record.DocumentJson), "");
        if (entries.Count >= MaxEntries)
        {
            entries.Clear();
        }

        entries[record.Id] = baseline;
        return baseline;
    }
}
