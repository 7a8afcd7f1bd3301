namespace Partwise.Storage.Flags;

/// <summary>A request for one page of flags, in increasing <see cref="FlagRecord.Sequence"/> (commit order).</summary>
/// <param name="BaselineId">Only flags of this baseline, or null for all.</param>
/// <param name="Status">Which review states to include.</param>
/// <param name="After">Only flags after this cursor, or null to start at the first.</param>
/// <param name="Limit">The most items to return, 1 to <see cref="MaxLimit"/>.</param>
public sealed record FlagQuery(
    string? BaselineId = null,
    FlagStatusFilter Status = FlagStatusFilter.Open,
    FlagCursor? After = null,
    int Limit = FlagQuery.DefaultLimit)
{
    /// <summary>The default page size.</summary>
    public const int DefaultLimit = 100;

    /// <summary>The largest page size; the host refuses more with 400 rather than clamping.</summary>
    public const int MaxLimit = 500;
}

/// <summary>One page of flags.</summary>
/// <param name="Items">The flags, in increasing sequence.</param>
/// <param name="Next">
/// Where to resume: after the last item, or the query's own cursor when the page is empty (null only when the
/// query had none). Following it never skips or repeats a flag, even while other replicas commit new ones.
/// </param>
/// <param name="HasMore">True when more flags matched than the limit allowed.</param>
/// <param name="Token">The change token read before the items: waiting on it wakes at the first change after them.</param>
public sealed record FlagPage(IReadOnlyList<FlagRecord> Items, FlagCursor? Next, bool HasMore, ChangeToken Token);
