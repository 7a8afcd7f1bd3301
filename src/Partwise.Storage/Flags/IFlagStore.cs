namespace Partwise.Storage.Flags;

/// <summary>Flags raised by screenings: listing with cursors, change tokens for ETags and long polling, review.</summary>
public interface IFlagStore
{
    /// <summary>One page of flags matching the query, with a resume cursor and the change token.</summary>
    /// <exception cref="ArgumentOutOfRangeException"><see cref="FlagQuery.Limit"/> is outside 1 to <see cref="FlagQuery.MaxLimit"/>.</exception>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<FlagPage> ListAsync(FlagQuery query, CancellationToken cancellationToken);

    /// <summary>The flag with <paramref name="id"/>, or null.</summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<FlagRecord?> GetAsync(string id, CancellationToken cancellationToken);

    /// <summary>
    /// Records a review: sets the status (confirmed or dismissed), note, reviewer and the review time, replacing an
    /// earlier review, and changes the change token. Returns the updated flag, or null when there is no such flag.
    /// </summary>
    /// <exception cref="ArgumentException"><paramref name="status"/> is <see cref="FlagStatus.Open"/>.</exception>
    /// <exception cref="StorageUnavailableException">The database cannot be reached; nothing changed.</exception>
    Task<FlagRecord?> ReviewAsync(string id, FlagStatus status, string? note, string? reviewer, CancellationToken cancellationToken);

    /// <summary>The current change token.</summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached.</exception>
    Task<ChangeToken> GetChangeTokenAsync(CancellationToken cancellationToken);

    /// <summary>
    /// Waits until the flags have changed since <paramref name="since"/> (a flag committed or a review, by this or any
    /// other replica) and returns the new token, or returns <paramref name="since"/> when <paramref name="timeout"/>
    /// passes first. Returns at once when the state has already moved on. Changes through this store instance wake
    /// waiters at once; changes by other connections are seen within <see cref="StorageOptions.ChangePollInterval"/>
    /// (one shared poll per store instance, however many wait).
    /// </summary>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="timeout"/> is negative.</exception>
    /// <exception cref="OperationCanceledException"><paramref name="cancellationToken"/> was cancelled.</exception>
    /// <exception cref="StorageUnavailableException">The database could not be read while waiting.</exception>
    Task<ChangeToken> WaitForChangeAsync(ChangeToken since, TimeSpan timeout, CancellationToken cancellationToken);
}
