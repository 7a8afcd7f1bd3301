using System.Security.Claims;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using Partwise.Api.Infrastructure;
using Partwise.Api.Tests.Support;
using Partwise.Storage;

namespace Partwise.Api.Tests.Limits;

/// <summary>Per-caller token buckets on the compute and screening routes, with small limits set through configuration.</summary>
public class RateLimitTests
{
    private const string Table = "{\"parts\": [\"Ca\", \"Mg\", \"Na\"], \"rows\": [[31.9, 8.1, 12.4], [28.4, 7.6, 11.8]], \"transform\": {\"type\": \"clr\"}}";

    // One token per 100 s: within a test, the bucket never refills.
    private static PartwiseFactory ComputeBurstOfTwo() => PartwiseFactory.WithSettings(
        ("Partwise:RateLimits:Compute:PermitsPerSecond", "0.01"),
        ("Partwise:RateLimits:Compute:Burst", "2"));

    [Fact]
    public async Task ACallerOverItsComputeBurstGetsA429ProblemWithRetryAfter()
    {
        using var factory = ComputeBurstOfTwo();
        using var client = factory.CreateClient();
        for (var i = 0; i < 2; i++)
        {
            using var ok = await client.PostJson("/v1/coordinates", Table);
            await ok.OkJson();
        }

        using var refused = await client.PostJson("/v1/coordinates", Table);
        var problem = await refused.Problem(429, "/problems/rate-limited");
        Assert.Contains("rate limit", problem.GetProperty("detail").GetString(), StringComparison.Ordinal);

        // The bucket gains one token per 100 s, so the next one is about 100 s away, in whole seconds.
        var retryAfter = Assert.Single(refused.Headers.GetValues("Retry-After"));
        var seconds = int.Parse(retryAfter, System.Globalization.CultureInfo.InvariantCulture);
        Assert.InRange(seconds, 1, 100);
    }

    [Fact]
    public async Task TheComputeRoutesShareOneBucketAndScreeningHasItsOwn()
    {
        using var factory = ComputeBurstOfTwo();
        using var client = factory.CreateClient();
        using var first = await client.PostJson("/v1/summary", Table);
        await first.OkJson();
        using var second = await client.PostJson("/v1/compositions/prepare", Table);
        await second.OkJson();
        using var third = await client.PostJson("/v1/distances", Table);
        await third.Problem(429, "/problems/rate-limited");

        // Screening is limited apart: an empty screening request still reaches its handler (a 400, not a 429).
        using var screening = await client.PostJson("/v1/screenings", "{}");
        Assert.NotEqual(429, (int)screening.StatusCode);

        // Routes without a limit are not counted at all.
        using var health = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        Assert.Equal(200, (int)health.StatusCode);
    }

    [Fact]
    public async Task EachKeyHasItsOwnBucket()
    {
        // The real credentials: two Bearer keys from the network, each its own caller.
        using var factory = PartwiseFactory.WithSettings([
            .. Partwise.Api.Tests.Credentials.CredentialHosts.Settings(),
            ("Partwise:RateLimits:Compute:PermitsPerSecond", "0.01"),
            ("Partwise:RateLimits:Compute:Burst", "1"),
        ]);
        factory.RemoteAddress = Partwise.Api.Tests.Credentials.CredentialHosts.Remote;
        using var reader = Partwise.Api.Tests.Credentials.CredentialHosts.Client(factory, Partwise.Api.Tests.Credentials.CredentialHosts.Keys["reader-1"].Key);
        using var compute = Partwise.Api.Tests.Credentials.CredentialHosts.Client(factory, Partwise.Api.Tests.Credentials.CredentialHosts.Keys["compute-1"].Key);
        using var first = await reader.PostJson("/v1/coordinates", Table);
        await first.OkJson();
        using var again = await reader.PostJson("/v1/coordinates", Table);
        await again.Problem(429, "/problems/rate-limited");
        using var other = await compute.PostJson("/v1/coordinates", Table);
        await other.OkJson();
    }

    [Fact]
    public async Task ScreeningOverItsBurstIsA429AndNothingIsStored()
    {
        using var factory = PartwiseFactory.WithSettings(
            ("Partwise:RateLimits:Screening:PermitsPerSecond", "0.01"),
            ("Partwise:RateLimits:Screening:Burst", "1"));
        using var client = factory.CreateClient();
        var id = (await BaselineBodies.Create(client, BaselineBodies.Request("rate-limited"))).GetProperty("id").GetString();
        await BaselineBodies.Screen(client, id!, "{\"sample\": " + BaselineBodies.Sample("s-1", 40, 30, 30) + "}");
        using var second = await client.PostJson($"/v1/baselines/{id}/screenings", "{\"sample\": " + BaselineBodies.Sample("s-2", 40, 30, 30) + "}");
        await second.Problem(429, "/problems/rate-limited");
        Assert.True(second.Headers.Contains("Retry-After"));

        // The refused sample was not screened: the store has the first and not the second.
        var store = factory.Services.GetRequiredService<PartwiseStorage>().Screenings;
        Assert.NotNull(await store.GetAsync(id!, "s-1", CancellationToken.None));
        Assert.Null(await store.GetAsync(id!, "s-2", CancellationToken.None));
    }

    [Fact]
    public async Task ZeroTurnsTheLimitOff()
    {
        using var factory = PartwiseFactory.WithSettings(
            ("Partwise:RateLimits:Compute:PermitsPerSecond", "0"),
            ("Partwise:RateLimits:Compute:Burst", "0"));
        using var client = factory.CreateClient();
        for (var i = 0; i < 20; i++)
        {
            using var response = await client.PostJson("/v1/coordinates", Table);
            await response.OkJson();
        }
    }

    [Fact]
    public void TheDefaultsAreGenerous()
    {
        var options = new RateLimitsOptions();
        Assert.Equal(1_000, options.Screening.PermitsPerSecond);
        Assert.Equal(2_000, options.Screening.Burst);
        Assert.Equal(1_000, options.Compute.PermitsPerSecond);
        Assert.Equal(2_000, options.Compute.Burst);
    }

    [Theory]
    [InlineData(1000, 2000, 100, 100)]
    [InlineData(15, 30, 2, 133.333)]
    [InlineData(1, 5, 1, 1000)]
    [InlineData(0.5, 1, 1, 2000)]
    public void TheBucketRefillsAtTheConfiguredRateInStepsOfAtLeastATenthOfASecond(double rate, int burst, int tokens, double milliseconds)
    {
        var bucket = RateLimits.BucketOf(new RateLimitSettings { PermitsPerSecond = rate, Burst = burst });
        Assert.Equal(burst, bucket.TokenLimit);
        Assert.Equal(tokens, bucket.TokensPerPeriod);
        Tolerance.Close(milliseconds, bucket.ReplenishmentPeriod.TotalMilliseconds, abs: 0.001, rel: 1e-6);
        Tolerance.Close(rate, bucket.TokensPerPeriod / bucket.ReplenishmentPeriod.TotalSeconds, abs: 1e-6, rel: 1e-6);
        Assert.Equal(0, bucket.QueueLimit);
    }

    [Fact]
    public void ACallerIsItsKeyNameElseItsAddress()
    {
        var anonymous = new DefaultHttpContext();
        anonymous.Connection.RemoteIpAddress = System.Net.IPAddress.Parse("192.0.2.7");
        Assert.Equal("ip:192.0.2.7", RateLimits.CallerOf(anonymous));

        var keyed = new DefaultHttpContext { User = new ClaimsPrincipal(new ClaimsIdentity([new Claim(ClaimTypes.Name, "lab-7")], "key")) };
        keyed.Connection.RemoteIpAddress = System.Net.IPAddress.Parse("192.0.2.7");
        Assert.Equal("key:lab-7", RateLimits.CallerOf(keyed));
    }

    [Theory]
    [InlineData("Screening:PermitsPerSecond", "-1")]
    [InlineData("Compute:PermitsPerSecond", "2000000")]
    [InlineData("Compute:PermitsPerSecond", "0.0001")]
    [InlineData("Compute:Burst", "0")]
    public void AnInvalidRateLimitStopsTheServiceAtStart(string name, string value)
    {
        using var factory = PartwiseFactory.WithSettings(($"Partwise:RateLimits:{name}", value));
        Assert.ThrowsAny<Exception>(() => factory.CreateClient());

        var configuration = new ConfigurationBuilder()
            .AddInMemoryCollection(new Dictionary<string, string?> { [$"{RateLimitsOptions.Section}:{name}"] = value })
            .Build();
        using var services = new ServiceCollection().AddPartwiseRateLimits(configuration).BuildServiceProvider();
        var error = Assert.Throws<OptionsValidationException>(() => services.GetRequiredService<IOptions<RateLimitsOptions>>().Value);
        Assert.Contains($"{RateLimitsOptions.Section}:{name}", error.Message, StringComparison.Ordinal);
    }
}
