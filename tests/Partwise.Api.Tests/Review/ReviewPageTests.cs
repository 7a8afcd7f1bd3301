using System.Net;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Review;

public class ReviewPageTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    [Fact]
    public async Task TheReviewPageIsServedAsHtmlWithoutCredentials()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/review", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        Assert.Equal("text/html", response.Content.Headers.ContentType?.MediaType);
        var html = await response.Content.ReadAsStringAsync();
        Assert.Contains("<h1>Flag review</h1>", html, StringComparison.Ordinal);
        Assert.Contains("statistical signals for a qualified analyst, not decisions", html, StringComparison.Ordinal);
        Assert.Contains("/review/review.js", html, StringComparison.Ordinal);
        Assert.Contains("default-src 'self'", response.Headers.GetValues("Content-Security-Policy").Single(), StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("/review/review.js", "text/javascript")]
    [InlineData("/review/review.css", "text/css")]
    public async Task ThePagesScriptAndStyleAreServedWithTheirTypes(string path, string mediaType)
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri(path, UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        Assert.Equal(mediaType, response.Content.Headers.ContentType?.MediaType);
        Assert.NotEmpty(await response.Content.ReadAsByteArrayAsync());
    }

    [Fact]
    public async Task AMatchingIfNoneMatchIsA304()
    {
        using var client = factory.CreateClient();
        using var first = await client.GetAsync(new Uri("/review", UriKind.Relative));
        using var again = new HttpRequestMessage(HttpMethod.Get, new Uri("/review", UriKind.Relative));
        again.Headers.TryAddWithoutValidation("If-None-Match", first.Headers.ETag!.ToString());
        using var response = await client.SendAsync(again);
        Assert.Equal(HttpStatusCode.NotModified, response.StatusCode);
    }
}
