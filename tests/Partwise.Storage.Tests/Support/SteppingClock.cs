namespace Partwise.Storage.Tests.Support;

/// <summary>A clock that moves on by a fixed step (with sub-microsecond ticks, to see them cut) at every reading.</summary>
public sealed class SteppingClock(DateTimeOffset start, TimeSpan step) : TimeProvider
{
    private long ticks = start.UtcTicks;

    /// <summary>A clock starting on 2026-03-02 08:00:00.1234567 UTC, one second and 3 ticks per reading.</summary>
    public SteppingClock()
        : this(new DateTimeOffset(2026, 3, 2, 8, 0, 0, TimeSpan.Zero).AddTicks(1_234_567), TimeSpan.FromSeconds(1) + TimeSpan.FromTicks(3))
    {
    }

    /// <summary>The reading the next call to <see cref="GetUtcNow"/> will give.</summary>
    public DateTimeOffset Peek() => new(Interlocked.Read(ref ticks), TimeSpan.Zero);

    /// <inheritdoc />
    public override DateTimeOffset GetUtcNow() => new(Interlocked.Add(ref ticks, step.Ticks) - step.Ticks, TimeSpan.Zero);
}
