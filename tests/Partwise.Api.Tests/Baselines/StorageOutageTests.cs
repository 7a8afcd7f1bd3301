using System.Net;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Baselines;

public class StorageOutageTests
{
    [Fact]
    public async Task AnUnreachablePostgresServerGives503NotA500()
    {
        // Nothing listens on port 1 of the loopback interface: every connection is refused.
        await using var factory = PartwiseFactory.WithSettings(("Partwise:Storage:PostgresConnectionString", "Host=127.0.0.1;Port=1;Username=partwise;Database=partwise;Timeout=3"));
        using var client = factory.CreateClient();
        using (var create = await client.PostJson("/v1/baselines", BaselineBodies.Request("outage")))
        {
            await create.Problem(503, "/problems/storage-unavailable");
            Assert.True(create.Headers.RetryAfter is not null);
        }

        using (var flags = await client.GetAsync(new Uri("/v1/flags", UriKind.Relative)))
        {
            await flags.Problem(503, "/problems/storage-unavailable");
        }

        using (var screen = await client.PostJson("/v1/baselines/any/screenings", "{\"sample\": " + BaselineBodies.Sample("s", 1, 2, 3) + "}"))
        {
            await screen.Problem(503, "/problems/storage-unavailable");
        }

        using var ready = await client.GetAsync(new Uri("/readyz", UriKind.Relative));
        await ready.Problem(503, "/problems/storage-unavailable");
        using var alive = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, alive.StatusCode);
        // The stateless routes do not need storage.
        using var inline = await client.PostJson("/v1/compositions/prepare", WorkedExample.Json());
        Assert.Equal(HttpStatusCode.OK, inline.StatusCode);
    }

    [Fact]
    public async Task AnUnusableSqliteDirectoryGives503AndTheServiceRecoversWhenItIsUsableAgain()
    {
        var root = Path.Combine(Path.GetTempPath(), "partwise-outage-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(root);
        var blocker = Path.Combine(root, "data");
        // A file where the data directory should be: the database cannot be created or opened.
        await File.WriteAllTextAsync(blocker, "not a directory");
        try
        {
            await using var factory = PartwiseFactory.WithSettings(("Partwise:Storage:DataDirectory", blocker));
            using var client = factory.CreateClient();
            using (var down = await client.PostJson("/v1/baselines", BaselineBodies.Request("sqlite-outage")))
            {
                await down.Problem(503, "/problems/storage-unavailable");
            }

            using (var notReady = await client.GetAsync(new Uri("/readyz", UriKind.Relative)))
            {
                await notReady.Problem(503, "/problems/storage-unavailable");
            }

            File.Delete(blocker);
            // While storage is down the service tries again at most once a second; within a few seconds it is back.
            var status = HttpStatusCode.ServiceUnavailable;
            for (var attempt = 0; attempt < 50 && status != HttpStatusCode.OK; attempt++)
            {
                using var ready = await client.GetAsync(new Uri("/readyz", UriKind.Relative));
                status = ready.StatusCode;
                if (status != HttpStatusCode.OK)
                {
                    Assert.Equal(HttpStatusCode.ServiceUnavailable, status);
                    await Task.Delay(200);
                }
            }

            Assert.Equal(HttpStatusCode.OK, status);

            var id = (await BaselineBodies.Create(client, BaselineBodies.Request("sqlite-recovered"))).GetProperty("id").GetString();
            var result = (await BaselineBodies.Screen(client, id!, "{\"sample\": " + BaselineBodies.Sample("back", 2, 2, 2) + "}")).GetProperty("results")[0];
            Assert.Equal("back", result.GetProperty("sampleId").GetString());
        }
        finally
        {
            Directory.Delete(root, recursive: true);
        }
    }
}
