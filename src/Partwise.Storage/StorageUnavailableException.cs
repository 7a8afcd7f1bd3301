namespace Partwise.Storage;

/// <summary>
/// The database cannot be reached or cannot take the operation now: connection refused or lost, timeout, pool
/// exhausted, server shutting down, disk full, disk I/O error, unopenable file, busy past the timeout. The host
/// answers 503 and nothing the caller sent was stored by the failed call. Every other exception from the store is
/// either an argument exception (a caller's mistake) or a defect.
/// </summary>
public sealed class StorageUnavailableException : Exception
{
    /// <summary>Creates the exception with a message and no inner exception.</summary>
    public StorageUnavailableException()
        : base("The database is unavailable.")
    {
    }

    /// <summary>Creates the exception with a message.</summary>
    public StorageUnavailableException(string message)
        : base(message)
    {
    }

    /// <summary>Creates the exception wrapping the provider's error.</summary>
    public StorageUnavailableException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
