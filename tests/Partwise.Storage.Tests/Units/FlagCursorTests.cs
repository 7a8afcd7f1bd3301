using Partwise.Storage.Flags;

namespace Partwise.Storage.Tests.Units;

public sealed class FlagCursorTests
{
    [Theory]
    [InlineData(0L)]
    [InlineData(1L)]
    [InlineData(255L)]
    [InlineData(4_294_967_296L)]
    [InlineData(long.MaxValue)]
    public void TheTextFormReadsBackToTheSameCursor(long sequence)
    {
        var text = new FlagCursor(sequence).ToString();

        Assert.True(FlagCursor.TryParse(text, out var read));
        Assert.Equal(sequence, read.Sequence);
        Assert.Matches("^[A-Za-z0-9_-]{18}$", text);
    }

    [Fact]
    public void MalformedTextIsDetected()
    {
        var good = new FlagCursor(42).ToString();
        var malformed = new List<string?>
        {
            null,
            "",
            "42",
            "not a cursor",
            good[..^1],
            good + "A",
            good + "==",
            "+" + good[1..],
            good[..^1] + "/",
            " " + good,
            new string('A', 18),
            new string('A', 200),
        };
        // Every single-character edit of a valid cursor.
        for (var i = 0; i < good.Length; i++)
        {
            var edited = good.ToCharArray();
            edited[i] = edited[i] == 'A' ? 'B' : 'A';
            malformed.Add(new string(edited));
        }

        Assert.All(malformed, text => Assert.False(FlagCursor.TryParse(text, out _), $"'{text}' was accepted"));
    }

    [Fact]
    public void NegativeSequenceIsRefused()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new FlagCursor(-1));
    }
}
