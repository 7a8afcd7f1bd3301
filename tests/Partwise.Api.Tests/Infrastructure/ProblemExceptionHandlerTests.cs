using System.Text.Json;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging.Abstractions;
using Partwise.Api.Infrastructure;

namespace Partwise.Api.Tests.Infrastructure;

public class ProblemExceptionHandlerTests
{
    private static DefaultHttpContext Context()
    {
        var services = new ServiceCollection().AddLogging().AddProblemDetails().BuildServiceProvider();
        return new DefaultHttpContext { RequestServices = services, Response = { Body = new MemoryStream() } };
    }

    [Fact]
    public async Task AnUnexpectedExceptionIsA500ProblemThatRevealsNothing()
    {
        var context = Context();
        var handler = new ProblemExceptionHandler(NullLogger<ProblemExceptionHandler>.Instance);
        Assert.True(await handler.TryHandleAsync(context, new InvalidOperationException("secret internals"), CancellationToken.None));
        Assert.Equal(500, context.Response.StatusCode);
        Assert.StartsWith("application/problem+json", context.Response.ContentType, StringComparison.Ordinal);
        context.Response.Body.Position = 0;
        var text = await new StreamReader(context.Response.Body).ReadToEndAsync();
        using var doc = JsonDocument.Parse(text);
        Assert.Equal("/problems/internal-error", doc.RootElement.GetProperty("type").GetString());
        Assert.DoesNotContain("secret", text, StringComparison.Ordinal);
    }

    [Fact]
    public async Task AServerBodyLimitRejectionIsA413Problem()
    {
        var context = Context();
        var handler = new ProblemExceptionHandler(NullLogger<ProblemExceptionHandler>.Instance);
        await handler.TryHandleAsync(context, new BadHttpRequestException("Request body too large.", 413), CancellationToken.None);
        Assert.Equal(413, context.Response.StatusCode);
        context.Response.Body.Position = 0;
        using var doc = await JsonDocument.ParseAsync(context.Response.Body);
        Assert.Equal("/problems/too-large", doc.RootElement.GetProperty("type").GetString());
    }
}
