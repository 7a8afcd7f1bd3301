using System.Net;
using Microsoft.AspNetCore.Mvc.Testing;

namespace Partwise.Api.Tests;

public class HealthTests(WebApplicationFactory<Program> factory) : IClassFixture<WebApplicationFactory<Program>>
{
    [Fact]
    public async Task HealthzAnswersOk()
    {
        using var client = factory.CreateClient();
        using var response = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
    }
}
