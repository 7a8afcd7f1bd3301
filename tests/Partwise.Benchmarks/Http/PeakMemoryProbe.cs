using System.Diagnostics;
using System.Globalization;
using System.Net.Http.Headers;

namespace Partwise.Benchmarks.Http;

/// <summary>
/// Peak memory of one <c>POST /v1/coordinates</c> of 100,000 × 20 in JSON, as a multiple of the body size. Goal:
/// below 10×. Measured as the growth of the process's peak working set over the request, after a warm-up request
/// so that the host's own start-up is not counted; the body itself is already in memory before the request.
/// Run: <c>dotnet run -c Release --project tests/Partwise.Benchmarks -- peak-memory</c>.
/// </summary>
public static class PeakMemoryProbe
{
    /// <summary>Prints the body size, the peak growth and their ratio.</summary>
    public static async Task RunAsync()
    {
        var body = CoordinatesBodies.Create(100_000, 20);
        var small = CoordinatesBodies.Create(100, 20);
        using var factory = LargeBodyHost.Create(body.Length);
        using var client = LargeBodyHost.CreateClient(factory);
        await PostAsync(client, small).ConfigureAwait(false);
        GC.Collect(2, GCCollectionMode.Forced, blocking: true, compacting: true);
        GC.WaitForPendingFinalizers();
        using var process = Process.GetCurrentProcess();
        process.Refresh();
        var before = ReadPeakResident();
        var current = process.WorkingSet64;
        var length = await PostAsync(client, body).ConfigureAwait(false);
        var after = ReadPeakResident();
        var growth = after - Math.Max(current, 0);
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"body {body.Length / 1e6:F1} MB, response {length / 1e6:F1} MB, resident before {current / 1e6:F1} MB (peak so far {before / 1e6:F1} MB), peak after {after / 1e6:F1} MB, peak growth {growth / 1e6:F1} MB = {(double)growth / body.Length:F2} x body"));
    }

    private static async Task<long> PostAsync(HttpClient client, byte[] body)
    {
        using var content = new ByteArrayContent(body);
        content.Headers.ContentType = new MediaTypeHeaderValue("application/json");
        using var response = await client.PostAsync(new Uri("/v1/coordinates", UriKind.Relative), content).ConfigureAwait(false);
        response.EnsureSuccessStatusCode();
        return (await response.Content.ReadAsByteArrayAsync().ConfigureAwait(false)).LongLength;
    }

    // VmHWM in /proc/self/status is the peak resident set size; resetting it needs root, so the probe reads the
    // peak before and after and reports the growth over the resident size at the start of the request.
    private static long ReadPeakResident()
    {
        foreach (var line in File.ReadLines("/proc/self/status"))
        {
            if (line.StartsWith("VmHWM:", StringComparison.Ordinal))
            {
                var kb = long.Parse(line[6..].Trim().Split(' ')[0], CultureInfo.InvariantCulture);
                return kb * 1024;
            }
        }

        return 0;
    }
}
