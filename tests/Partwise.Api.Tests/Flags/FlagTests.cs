using System.Diagnostics;
using System.Net;
using System.Text.Json;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Flags;

/// <summary>Each test has its own host and store, since flags and change tokens are global to a store.</summary>
public class FlagTests
{
    private static async Task<(PartwiseFactory Factory, HttpClient Client, string BaselineId)> Start()
    {
        var factory = new PartwiseFactory();
        var client = factory.CreateClient();
        var id = (await BaselineBodies.Create(client, BaselineBodies.Request("flags"))).GetProperty("id").GetString()!;
        return (factory, client, id);
    }

    private static async Task<string> Flag(HttpClient client, string baselineId, string sampleId)
    {
        var result = (await BaselineBodies.Screen(client, baselineId, "{\"sample\": " + BaselineBodies.Sample(sampleId, 9, 1, 1) + "}")).GetProperty("results")[0];
        Assert.True(result.GetProperty("flagged").GetBoolean());
        return result.GetProperty("flagId").GetString()!;
    }

    private static Task<HttpResponseMessage> Get(HttpClient client, string query, string? ifNoneMatch = null)
    {
        var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/v1/flags" + query, UriKind.Relative));
        if (ifNoneMatch is not null)
        {
            request.Headers.TryAddWithoutValidation("If-None-Match", ifNoneMatch);
        }

        return client.SendAsync(request);
    }

    [Fact]
    public async Task FlaggedScreeningsAreListedOpenWithTheirReasonsAndACursor()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var first = await Flag(client, baseline, "f-1");
        var second = await Flag(client, baseline, "f-2");
        using var response = await Get(client, "");
        var page = await response.OkJson();
        var items = page.GetProperty("items");
        Assert.Equal([first, second], items.EnumerateArray().Select(f => f.GetProperty("id").GetString()));
        var item = items[0];
        Assert.Equal(baseline, item.GetProperty("baselineId").GetString());
        Assert.Equal("f-1", item.GetProperty("sampleId").GetString());
        Assert.Equal("test-lab", item.GetProperty("source").GetString());
        Assert.Equal("open", item.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, item.GetProperty("review").ValueKind);
        Assert.Equal(3, item.GetProperty("reasons").GetArrayLength());
        Tolerance.Close(Math.Sqrt(BaselineBodies.HandSquaredDistance(9, 1, 1)), item.GetProperty("distance").GetDouble(), 1e-10, 1e-9);
        Assert.False(page.GetProperty("hasMore").GetBoolean());
        Assert.NotNull(response.Headers.ETag);

        using var paged = await Get(client, "?limit=1");
        var one = await paged.OkJson();
        Assert.Equal(1, one.GetProperty("items").GetArrayLength());
        Assert.True(one.GetProperty("hasMore").GetBoolean());
        using var rest = await Get(client, "?limit=1&after=" + one.GetProperty("next").GetString());
        Assert.Equal(second, (await rest.OkJson()).GetProperty("items")[0].GetProperty("id").GetString());

        using var other = await Get(client, "?baseline=someone-else");
        Assert.Equal(0, (await other.OkJson()).GetProperty("items").GetArrayLength());
    }

    [Theory]
    [InlineData("?after=not-a-cursor", "/after")]
    [InlineData("?after=AQAAAAAAAAACrP3o4B", "/after")]
    [InlineData("?limit=0", "/limit")]
    [InlineData("?limit=501", "/limit")]
    [InlineData("?limit=ten", "/limit")]
    [InlineData("?waitSeconds=31", "/waitSeconds")]
    [InlineData("?waitSeconds=-1", "/waitSeconds")]
    [InlineData("?status=closed", "/status")]
    [InlineData("?baseline=", "/baseline")]
    public async Task BadQueryParametersAre400NamingTheParameter(string query, string pointer)
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        using var response = await Get(client, query);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task AMatchingIfNoneMatchIs304AndANewFlagChangesTheETag()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        await Flag(client, baseline, "e-1");
        using var first = await Get(client, "?status=any");
        var etag = first.Headers.ETag!.ToString();
        using (var same = await Get(client, "?status=any", etag))
        {
            Assert.Equal(HttpStatusCode.NotModified, same.StatusCode);
            Assert.Empty(await same.Content.ReadAsByteArrayAsync());
        }

        using (var otherQuery = await Get(client, "?status=open", etag))
        {
            Assert.Equal(HttpStatusCode.OK, otherQuery.StatusCode);
        }

        await Flag(client, baseline, "e-2");
        using var changed = await Get(client, "?status=any", etag);
        Assert.Equal(HttpStatusCode.OK, changed.StatusCode);
        Assert.NotEqual(etag, changed.Headers.ETag!.ToString());
    }

    [Fact]
    public async Task ALongPollIsWokenByAScreeningPostedMeanwhile()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        using var before = await Get(client, "");
        var page = await before.OkJson();
        Assert.Equal(0, page.GetProperty("items").GetArrayLength());
        var etag = before.Headers.ETag!.ToString();

        var clock = Stopwatch.StartNew();
        var poll = Get(client, "?waitSeconds=20", etag);
        await Task.Delay(500);
        Assert.False(poll.IsCompleted, "the long poll answered before anything changed");
        var flagId = await Flag(client, baseline, "woken");
        using var woken = await poll;
        clock.Stop();
        var items = (await woken.OkJson()).GetProperty("items");
        Assert.Equal(flagId, items[0].GetProperty("id").GetString());
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(15), $"the poll took {clock.Elapsed}");
        Assert.NotEqual(etag, woken.Headers.ETag!.ToString());
    }

    [Fact]
    public async Task ALongPollWithoutAnIfNoneMatchWaitsOnAnEmptyPage()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var poll = Get(client, "?waitSeconds=20");
        await Task.Delay(500);
        Assert.False(poll.IsCompleted);
        var flagId = await Flag(client, baseline, "waited");
        using var response = await poll;
        Assert.Equal(flagId, (await response.OkJson()).GetProperty("items")[0].GetProperty("id").GetString());
    }

    [Fact]
    public async Task ALongPollWithNothingNewIs304AtTheTimeout()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        await Flag(client, baseline, "quiet");
        using var before = await Get(client, "");
        var etag = before.Headers.ETag!.ToString();
        var clock = Stopwatch.StartNew();
        using var response = await Get(client, "?waitSeconds=1", etag);
        Assert.Equal(HttpStatusCode.NotModified, response.StatusCode);
        Assert.True(clock.Elapsed >= TimeSpan.FromSeconds(0.9), $"answered after {clock.Elapsed}");

        // Without If-None-Match a page that has items answers at once.
        clock.Restart();
        using var immediate = await Get(client, "?waitSeconds=5");
        Assert.Equal(1, (await immediate.OkJson()).GetProperty("items").GetArrayLength());
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(4));
    }

    [Fact]
    public async Task AReviewSetsTheStatusAndMovesTheFlagOutOfTheOpenList()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var flagId = await Flag(client, baseline, "reviewed");
        using var before = await Get(client, "");
        var etag = before.Headers.ETag!.ToString();
        using var review = await client.PostJson($"/v1/flags/{flagId}/review", "{\"status\": \"confirmed\", \"note\": \"seen twice\", \"reviewer\": \"analyst-1\"}");
        var flag = await review.OkJson();
        Assert.Equal("confirmed", flag.GetProperty("status").GetString());
        Assert.Equal("seen twice", flag.GetProperty("review").GetProperty("note").GetString());
        Assert.Equal("analyst-1", flag.GetProperty("review").GetProperty("reviewer").GetString());

        using var open = await Get(client, "");
        Assert.Equal(0, (await open.OkJson()).GetProperty("items").GetArrayLength());
        using var confirmed = await Get(client, "?status=confirmed");
        Assert.Equal(flagId, (await confirmed.OkJson()).GetProperty("items")[0].GetProperty("id").GetString());
        using var changed = await Get(client, "", etag);
        Assert.Equal(HttpStatusCode.OK, changed.StatusCode);

        using var dismissed = await client.PostJson($"/v1/flags/{flagId}/review", "{\"status\": \"dismissed\"}");
        Assert.Equal("dismissed", (await dismissed.OkJson()).GetProperty("status").GetString());
    }

    [Theory]
    [InlineData("{\"status\": \"open\"}")]
    [InlineData("{\"status\": \"maybe\"}")]
    [InlineData("{\"note\": \"no status\"}")]
    public async Task AReviewNeedsConfirmedOrDismissed(string body)
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var flagId = await Flag(client, baseline, "bad-review");
        using var response = await client.PostJson($"/v1/flags/{flagId}/review", body);
        await response.Problem(400, "/problems/invalid-input", "/status");
    }

    [Fact]
    public async Task ReviewingAnUnknownFlagIs404()
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/flags/no-such-flag/review", "{\"status\": \"dismissed\"}");
        await response.Problem(404, "/problems/not-found");
    }
}
