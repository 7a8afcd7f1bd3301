using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.Primitives;
using Partwise.Api.Infrastructure;

namespace Partwise.Api.Tests.Infrastructure;

public class NegotiationAndRequestIdTests
{
    [Theory]
    [InlineData(null, false)]
    [InlineData("text/csv", true)]
    [InlineData("text/csv;q=0", false)]
    [InlineData("text/*", false)]
    [InlineData("*/*", false)]
    [InlineData("application/json, text/csv;q=0.9", false)]
    [InlineData("application/json;q=0.1, text/csv;q=0.9", true)]
    [InlineData("not a media type", false)]
    public void CsvIsChosenOnlyWhenAcceptPrefersIt(string? accept, bool csv)
    {
        var context = new DefaultHttpContext();
        if (accept is not null)
        {
            context.Request.Headers.Accept = accept;
        }

        Assert.Equal(csv, Negotiation.PrefersCsv(context.Request));
    }

    [Theory]
    [InlineData("abc", true)]
    [InlineData("a b", true)]
    [InlineData("", false)]
    [InlineData("   ", false)]
    [InlineData("tab\there", false)]
    [InlineData("newline\n", false)]
    public void RequestIdsMustBePrintableAscii(string id, bool sane) => Assert.Equal(sane, RequestId.IsSane(new StringValues(id)));

    [Fact]
    public void TwoRequestIdHeadersAreNotEchoed() => Assert.False(RequestId.IsSane(new StringValues(["a", "b"])));
}
