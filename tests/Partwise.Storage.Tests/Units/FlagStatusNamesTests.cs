using Partwise.Storage.Flags;

namespace Partwise.Storage.Tests.Units;

public sealed class FlagStatusNamesTests
{
    [Theory]
    [InlineData(FlagStatus.Open, "open")]
    [InlineData(FlagStatus.Confirmed, "confirmed")]
    [InlineData(FlagStatus.Dismissed, "dismissed")]
    public void StatusNamesAreTheLowercaseWireNamesBothWays(FlagStatus status, string name)
    {
        Assert.Equal(name, FlagStatusNames.ToName(status));
        Assert.True(FlagStatusNames.TryParseStatus(name, out var read));
        Assert.Equal(status, read);
    }

    [Theory]
    [InlineData("open", FlagStatusFilter.Open)]
    [InlineData("confirmed", FlagStatusFilter.Confirmed)]
    [InlineData("dismissed", FlagStatusFilter.Dismissed)]
    [InlineData("any", FlagStatusFilter.Any)]
    public void FilterNamesIncludeAny(string name, FlagStatusFilter filter)
    {
        Assert.True(FlagStatusNames.TryParseFilter(name, out var read));
        Assert.Equal(filter, read);
    }

    [Theory]
    [InlineData(null)]
    [InlineData("")]
    [InlineData("Open")]
    [InlineData("closed")]
    public void OtherNamesAreNotStatuses(string? name)
    {
        Assert.False(FlagStatusNames.TryParseFilter(name, out _));
        Assert.False(FlagStatusNames.TryParseStatus(name, out _));
        Assert.False(FlagStatusNames.TryParseStatus("any", out _));
    }
}
