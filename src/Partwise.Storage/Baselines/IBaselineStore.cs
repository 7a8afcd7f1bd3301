namespace Partwise.Storage.Baselines;

/// <summary>Baseline documents, immutable once created, versioned per name, retired rather than deleted.</summary>
public interface IBaselineStore
{
    /// <summary>
    /// Creates a baseline under <paramref name="name"/>: the store assigns the id, the next version for the name and
    /// the creation time, calls <paramref name="renderDocument"/> with them inside the transaction and stores what it
    /// returns. Concurrent creations under one name (from any replica) get distinct, consecutive versions. If
    /// <paramref name="renderDocument"/> throws, nothing is stored and the version is not used up.
    /// </summary>
    /// <exception cref="ArgumentException"><paramref name="name"/> is blank or the rendered document is empty.</exception>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<BaselineRecord> CreateAsync(string name, Func<BaselineStamp, string> renderDocument, CancellationToken cancellationToken);

    /// <summary>The baseline with <paramref name="id"/>, retired or not, or null when there is none.</summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<BaselineRecord?> GetAsync(string id, CancellationToken cancellationToken);

    /// <summary>All baselines, the most recently created first; with <paramref name="activeOnly"/> the retired ones are left out.</summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<IReadOnlyList<BaselineRecord>> ListAsync(bool activeOnly, CancellationToken cancellationToken);

    /// <summary>
    /// Retires the baseline: idempotent, the first retirement time is kept. Returns whether the baseline exists
    /// (false: unknown id, nothing changed).
    /// </summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<bool> RetireAsync(string id, CancellationToken cancellationToken);
}
