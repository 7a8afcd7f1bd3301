using System.Net.Http.Headers;
using System.Text.Json;
using BenchmarkDotNet.Attributes;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.AspNetCore.TestHost;
using Microsoft.Extensions.Configuration;
using Partwise.Api.Credentials;

namespace Partwise.Benchmarks.Http;

/// <summary>
/// <c>POST /v1/coordinates</c> with 100,000 × 20 in JSON, end to end in-process (test server: body read, table
/// validated, ilr computed, JSON written and read back by the client). Goal: within 3× of the time
/// System.Text.Json alone takes to deserialize the same body into arrays, the baseline of this class.
/// </summary>
[MemoryDiagnoser]
public class CoordinatesEndpointBenchmarks : IDisposable
{
    private static readonly JsonSerializerOptions Web = new(JsonSerializerDefaults.Web);
    private byte[] _body = [];
    private WebApplicationFactory<Program> _factory = null!;
    private HttpClient _client = null!;

    [GlobalSetup]
    public void Setup()
    {
        _body = CoordinatesBodies.Create(100_000, 20);
        _factory = LargeBodyHost.Create(_body.Length);
        _client = LargeBodyHost.CreateClient(_factory);
    }

    [Benchmark(Baseline = true)]
    public TableBody? DeserializeOnly() => JsonSerializer.Deserialize<TableBody>(_body, Web);

    [Benchmark]
    public async Task<long> PostCoordinates()
    {
        using var content = new ByteArrayContent(_body);
        content.Headers.ContentType = new MediaTypeHeaderValue("application/json");
        using var response = await _client.PostAsync(new Uri("/v1/coordinates", UriKind.Relative), content).ConfigureAwait(false);
        response.EnsureSuccessStatusCode();
        var bytes = await response.Content.ReadAsByteArrayAsync().ConfigureAwait(false);
        return bytes.LongLength;
    }

    [GlobalCleanup]
    public void Dispose()
    {
        _client?.Dispose();
        _factory?.Dispose();
        GC.SuppressFinalize(this);
    }
}

/// <summary>The real host with the body limit raised to fit the benchmark's body, and one key its clients send.</summary>
public static class LargeBodyHost
{
    /// <summary>The benchmark's key (no secret: it exists only in this in-process host).</summary>
    public const string Key = "benchmark-key-0123456789abcdefghijklmnopq";

    /// <summary>A factory whose body limit is four times <paramref name="bodyBytes"/>, accepting <see cref="Key"/>.</summary>
    public static WebApplicationFactory<Program> Create(long bodyBytes) =>
        new WebApplicationFactory<Program>().WithWebHostBuilder(b => b.UseSolutionRelativeContentRoot("src/Partwise.Api").ConfigureAppConfiguration(c => c.AddInMemoryCollection(
            new Dictionary<string, string?>
            {
                ["Partwise:Limits:MaxBodyBytes"] = (4 * bodyBytes).ToString(System.Globalization.CultureInfo.InvariantCulture),
                ["Partwise:Credentials:Keys:0:Name"] = "benchmark",
                ["Partwise:Credentials:Keys:0:Sha256"] = KeyHash.Hex(Key),
            })));

    /// <summary>A client of <paramref name="factory"/> that sends <see cref="Key"/>.</summary>
    public static HttpClient CreateClient(WebApplicationFactory<Program> factory)
    {
        ArgumentNullException.ThrowIfNull(factory);
        var client = factory.CreateClient();
        client.DefaultRequestHeaders.Authorization = new AuthenticationHeaderValue("Bearer", Key);
        return client;
    }
}
