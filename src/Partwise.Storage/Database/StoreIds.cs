namespace Partwise.Storage.Database;

/// <summary>Opaque identifiers for baselines and flags.</summary>
internal static class StoreIds
{
    /// <summary>
    /// A version 7 UUID (RFC 9562) as 32 lowercase hex digits: unique without a round trip to the database, and
    /// roughly time-ordered so index pages fill at the end.
    /// </summary>
    public static string New() => Guid.CreateVersion7().ToString("N");
}
