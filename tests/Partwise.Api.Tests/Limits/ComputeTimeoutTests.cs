using System.Globalization;
using System.Text;
using Partwise.Api.Infrastructure;
using Partwise.Api.Tests.Support;
using Serilog.Events;

namespace Partwise.Api.Tests.Limits;

/// <summary>The compute timeout: a computation past <c>Partwise:Limits:ComputeTimeoutSeconds</c> stops and is a 503 problem.</summary>
public class ComputeTimeoutTests
{
    [Fact]
    public async Task ASelectionPastTheTimeoutStopsInTheMathLibraryAndIsA503Problem()
    {
        using var factory = PartwiseFactory.WithLimits(("ComputeTimeoutSeconds", "0.5"));
        using var client = factory.CreateClient();

        // 1,000 parts: K0 is 1,000 × 1,000, N = K F K alone is 10⁹ products and each of up to 999 steps scans 499,500
        // candidates, so the whole path takes far longer than half a second; the body itself is small (30 rows).
        using var response = await client.PostJson("/v1/ratio-selection", WideTable(30, 1_000));
        var problem = await response.Problem(503, "/problems/timeout");
        Assert.Contains("0.5 s", problem.GetProperty("detail").GetString(), StringComparison.Ordinal);

        // The handler had read the table (its shape is in the completion event) but the selection never returned:
        // the ratio count it sets after RatioSelection.Run is missing, so the cancellation came from inside the run.
        var completion = Assert.Single(factory.Logs.Events, IsCompletion);
        Assert.Equal("503", completion.Properties["StatusCode"].ToString());
        Assert.Equal("1000", completion.Properties["PartCount"].ToString());
        Assert.False(completion.Properties.ContainsKey("RatioCount"));
        Assert.DoesNotContain(factory.Logs.Events, e => e.Exception is not null && e.Level >= LogEventLevel.Error);
    }

    [Fact]
    public async Task AFastComputationIsNotAffected()
    {
        using var factory = PartwiseFactory.WithLimits(("ComputeTimeoutSeconds", "30"));
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/ratio-selection", WideTable(10, 4));
        var body = await response.OkJson();
        Assert.Equal(3, body.GetProperty("steps").GetArrayLength());
    }

    [Fact]
    public void TheDefaultTimeoutIsThirtySeconds() => Assert.Equal(30, new LimitsOptions().ComputeTimeoutSeconds);

    // n rows of J seeded log-normal parts (all positive, so the default reject policy takes them).
    internal static string WideTable(int n, int j)
    {
        var random = new Random(20261202);
        var json = new StringBuilder("{\"parts\": [");
        json.AppendJoin(", ", Enumerable.Range(0, j).Select(k => $"\"p{k}\""));
        json.Append("], \"rows\": [");
        for (var i = 0; i < n; i++)
        {
            json.Append(i == 0 ? "[" : ", [");
            json.AppendJoin(", ", Enumerable.Range(0, j).Select(_ => Math.Exp(2 * random.NextDouble()).ToString("R", CultureInfo.InvariantCulture)));
            json.Append(']');
        }

        return json.Append("]}").ToString();
    }

    internal static bool IsCompletion(LogEvent e) =>
        e.Properties.TryGetValue("SourceContext", out var value) && value.ToString().Trim('"') == "Serilog.AspNetCore.RequestLoggingMiddleware";
}
