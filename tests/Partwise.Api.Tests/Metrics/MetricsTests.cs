using System.Net;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Metrics;

/// <summary>
/// The counters and histograms at <c>/metrics</c> move by what the requests did. Prometheus keeps one registry per
/// process, so these tests run alone (their collection is not parallel) and compare a scrape after the requests
/// with one before.
/// </summary>
[Collection(MetricsCollection.Name)]
public class MetricsTests
{
    [Fact]
    public async Task HttpRequestsAreCountedAndTimedByRouteTemplateAndStatusWithoutTheScrapeItself()
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        var before = await Exposition.Scrape(client);

        for (var i = 0; i < 3; i++)
        {
            using var alive = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
            Assert.Equal(HttpStatusCode.OK, alive.StatusCode);
        }

        for (var i = 0; i < 2; i++)
        {
            using var ok = await client.PostJson("/v1/coordinates", WorkedExample.Json("\"transform\": {\"type\": \"clr\"}"));
            await ok.OkJson();
        }

        using (var bad = await client.PostJson("/v1/coordinates", "{"))
        {
            await bad.Problem(400, "/problems/invalid-input");
        }

        using (var missing = await client.GetAsync(new Uri("/v1/baselines/no-such-baseline-7f3", UriKind.Relative)))
        {
            await missing.Problem(404, "/problems/not-found");
        }

        var after = await Exposition.Scrape(client);

        double Moved(string name, string code, string method, string endpoint)
        {
            (string, string)[] labels = [("code", code), ("method", method), ("endpoint", endpoint)];
            return after.Sum(name, labels) - before.Sum(name, labels);
        }

        Assert.Equal(3, Moved("http_requests_received_total", "200", "GET", "/healthz"));
        Assert.Equal(2, Moved("http_requests_received_total", "200", "POST", "/v1/coordinates"));
        Assert.Equal(1, Moved("http_requests_received_total", "400", "POST", "/v1/coordinates"));
        Assert.Equal(1, Moved("http_requests_received_total", "404", "GET", "/v1/baselines/{id}"));
        Assert.Equal(3, Moved("http_request_duration_seconds_count", "200", "GET", "/healthz"));
        Assert.Equal(2, Moved("http_request_duration_seconds_count", "200", "POST", "/v1/coordinates"));
        Assert.Equal(1, Moved("http_request_duration_seconds_count", "400", "POST", "/v1/coordinates"));

        // The raw path (with its id) is never a label value, and the scrapes are not counted.
        Assert.DoesNotContain(after.Samples, s => s.Labels.Values.Any(v => v.Contains("no-such-baseline", StringComparison.Ordinal)));
        Assert.DoesNotContain(after.Samples, s => s.Name.StartsWith("http_request", StringComparison.Ordinal) && s.Labels.GetValueOrDefault("endpoint") == "/metrics");
        Assert.Equal(0, Moved("http_requests_received_total", "200", "GET", ""));
    }

    [Fact]
    public async Task ScreeningsFlagsReviewsAndFitsAreCountedByTheirLabels()
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        var before = await Exposition.Scrape(client);

        var id = (await BaselineBodies.Create(client, BaselineBodies.Request("metrics"))).GetProperty("id").GetString()!;
        // Two samples near the reference rows, one far from them (a ten-fold a/c), and then the far one again.
        var batch = "{\"samples\": [" + BaselineBodies.Sample("near-1", 2.0, 2.0, 2.6) + ", " + BaselineBodies.Sample("near-2", 2.1, 1.9, 2.5) + ", "
            + BaselineBodies.Sample("far", 60, 2.0, 2.0) + "]}";
        var results = (await BaselineBodies.Screen(client, id, batch)).GetProperty("results");
        Assert.False(results[0].GetProperty("flagged").GetBoolean());
        Assert.False(results[1].GetProperty("flagged").GetBoolean());
        Assert.True(results[2].GetProperty("flagged").GetBoolean());
        var again = (await BaselineBodies.Screen(client, id, "{\"sample\": " + BaselineBodies.Sample("far", 60, 2.0, 2.0) + "}")).GetProperty("results")[0];
        Assert.True(again.GetProperty("duplicate").GetBoolean());

        var flagId = results[2].GetProperty("flagId").GetString();
        using (var review = await client.PostJson($"/v1/flags/{flagId}/review", "{\"status\": \"dismissed\", \"note\": \"sampling error\", \"reviewer\": \"metrics-test\"}"))
        {
            await review.OkJson();
        }

        using (var inline = await client.PostJson("/v1/screenings", "{\"baseline\": " + await BaselineDocument(client, id) + ", \"sample\": " + BaselineBodies.Sample("inline-1", 2.0, 2.0, 2.6) + "}"))
        {
            await inline.OkJson();
        }

        var after = await Exposition.Scrape(client);
        double Moved(string name, params (string, string)[] labels) => after.Sum(name, labels) - before.Sum(name, labels);

        // The duplicate is not a new screening and raises no second flag.
        Assert.Equal(2, Moved("partwise_screenings_total", ("baseline", id), ("flagged", "false")));
        Assert.Equal(1, Moved("partwise_screenings_total", ("baseline", id), ("flagged", "true")));
        Assert.Equal(1, Moved("partwise_flags_raised_total", ("baseline", id)));
        Assert.Equal(1, Moved("partwise_screenings_total", ("baseline", "inline"), ("flagged", "false")));
        Assert.Equal(1, Moved("partwise_flag_reviews_total", ("status", "dismissed")));
        Assert.Equal(0, Moved("partwise_flag_reviews_total", ("status", "confirmed")));
        Assert.Equal(1, Moved("partwise_baseline_fit_duration_seconds_count"));
        Assert.True(after.Sum("partwise_baseline_fit_duration_seconds_sum") > before.Sum("partwise_baseline_fit_duration_seconds_sum"));
    }

    [Fact]
    public async Task RatioSelectionsAreTimedForTheEndpointAndForSelectionBaselines()
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        var before = await Exposition.Scrape(client);

        using (var selection = await client.PostJson("/v1/ratio-selection", "{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 4], [2, 2.1, 3], [3, 1.2, 2.2], [2.2, 3, 2]]}"))
        {
            await selection.OkJson();
        }

        await BaselineBodies.Create(client, BaselineBodies.Request("metrics-selection", "\"scatter\": \"classical\", \"coordinates\": {\"type\": \"selection\"}"));
        var after = await Exposition.Scrape(client);

        Assert.Equal(1, after.Sum("partwise_selection_duration_seconds_count", ("purpose", "ratio-selection")) - before.Sum("partwise_selection_duration_seconds_count", ("purpose", "ratio-selection")));
        Assert.Equal(1, after.Sum("partwise_selection_duration_seconds_count", ("purpose", "baseline")) - before.Sum("partwise_selection_duration_seconds_count", ("purpose", "baseline")));
        // Every observation lands in the +Inf bucket, so it equals the count.
        Assert.Equal(
            after.Sum("partwise_selection_duration_seconds_count", ("purpose", "baseline")),
            after.Sum("partwise_selection_duration_seconds_bucket", ("purpose", "baseline"), ("le", "+Inf")));
    }

    [Fact]
    public async Task RequestsThatStorageCouldNotServeAreCountedByOperationAndAs503s()
    {
        // Nothing listens on port 1 of the loopback interface: every connection is refused.
        await using var factory = PartwiseFactory.WithSettings(("Partwise:Storage:PostgresConnectionString", "Host=127.0.0.1;Port=1;Username=partwise;Database=partwise;Timeout=3"));
        using var client = factory.CreateClient();
        var before = await Exposition.Scrape(client);

        using (var create = await client.PostJson("/v1/baselines", BaselineBodies.Request("metrics-outage")))
        {
            await create.Problem(503, "/problems/storage-unavailable");
        }

        using (var ready = await client.GetAsync(new Uri("/readyz", UriKind.Relative)))
        {
            await ready.Problem(503, "/problems/storage-unavailable");
        }

        var after = await Exposition.Scrape(client);
        double Moved(string name, params (string, string)[] labels) => after.Sum(name, labels) - before.Sum(name, labels);

        Assert.Equal(1, Moved("partwise_storage_errors_total", ("operation", "CreateBaseline")));
        Assert.Equal(1, Moved("partwise_storage_errors_total", ("operation", "GetReadiness")));
        // The failed request keeps its route template though the exception handler answered it.
        Assert.Equal(1, Moved("http_requests_received_total", ("code", "503"), ("method", "POST"), ("endpoint", "/v1/baselines")));
        Assert.Equal(1, Moved("http_requests_received_total", ("code", "503"), ("method", "GET"), ("endpoint", "/readyz")));
    }

    [Fact]
    public void TheParserReadsLabelsWithEscapesAndSpecialValues()
    {
        // Lines in the form of the format's own description (prometheus.io, "Exposition formats", text format example).
        var scrape = Exposition.Parse(
            "# HELP http_requests_total The total number of HTTP requests.\n" +
            "# TYPE http_requests_total counter\n" +
            "http_requests_total{method=\"post\",code=\"200\"} 1027 1395066363000\n" +
            "msdos_file_access_time_seconds{path=\"C:\\\\DIR\\\\FILE.TXT\",error=\"Cannot find file:\\n\\\"FILE.TXT\\\"\"} 1.458255915e9\n" +
            "metric_without_timestamp_and_labels 12.47\n" +
            "rpc_duration_seconds_bucket{le=\"+Inf\"} 144320\n");
        Assert.Equal(1027, scrape.Sum("http_requests_total", ("code", "200")));
        Assert.Equal(0, scrape.Sum("http_requests_total", ("code", "500")));
        Assert.Equal(1.458255915e9, scrape.Sum("msdos_file_access_time_seconds", ("path", "C:\\DIR\\FILE.TXT"), ("error", "Cannot find file:\n\"FILE.TXT\"")));
        Assert.Equal(12.47, scrape.Sum("metric_without_timestamp_and_labels"));
        Assert.Equal(144320, scrape.Sum("rpc_duration_seconds_bucket", ("le", "+Inf")));
    }

    private static async Task<string> BaselineDocument(HttpClient client, string id)
    {
        using var response = await client.GetAsync(new Uri($"/v1/baselines/{id}", UriKind.Relative));
        return (await response.OkJson()).GetRawText();
    }
}

/// <summary>Tests that read the process's one metrics registry: run alone, after the parallel tests.</summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class MetricsCollection
{
    /// <summary>The collection's name.</summary>
    public const string Name = "Metrics";
}
