using System.Runtime.CompilerServices;

namespace Partwise.Core;

/// <summary>
/// Where the long loops look at their caller's <see cref="CancellationToken"/>: a request that times out or whose
/// caller went away stops within a few milliseconds of work instead of running to the end. Row loops look once per
/// <see cref="RowStride"/> rows, so the check costs nothing next to the logs of a row.
/// </summary>
internal static class Cancellation
{
    /// <summary>Rows between two looks in a row loop (a power of two): about 20,000 logarithms at 20 parts.</summary>
    internal const int RowStride = 1024;

    /// <summary>Throws <see cref="OperationCanceledException"/> at every <see cref="RowStride"/>-th row once the token is cancelled.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static void AtRow(int row, CancellationToken cancellationToken)
    {
        if ((row & (RowStride - 1)) == 0)
        {
            cancellationToken.ThrowIfCancellationRequested();
        }
    }
}
