using System.Net.Http.Headers;
using System.Text;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using Partwise.Api.Infrastructure;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests;

/// <summary>Size limits (413) and computation limits (422), with small limits set through configuration.</summary>
public class LimitsTests
{
    private static string Rows(int n, int j) =>
        "[" + string.Join(", ", Enumerable.Range(0, n).Select(i => "[" + string.Join(", ", Enumerable.Range(1, j).Select(k => (k + i).ToString(System.Globalization.CultureInfo.InvariantCulture))) + "]")) + "]";

    private static string Parts(int j) => "[" + string.Join(", ", Enumerable.Range(0, j).Select(k => $"\"p{k}\"")) + "]";

    [Fact]
    public async Task ABodyOverTheByteLimitIsA413()
    {
        using var factory = PartwiseFactory.WithLimits(("MaxBodyBytes", "2048"));
        using var client = factory.CreateClient();
        var json = "{\"parts\": " + Parts(3) + ", \"rows\": " + Rows(200, 3) + ", \"transform\": {\"type\": \"clr\"}}";
        Assert.True(json.Length > 2048);
        using var response = await client.PostJson("/v1/coordinates", json);
        await response.Problem(413, "/problems/too-large", "");
    }

    [Fact]
    public async Task AChunkedBodyOverTheByteLimitIsA413()
    {
        using var factory = PartwiseFactory.WithLimits(("MaxBodyBytes", "2048"));
        using var client = factory.CreateClient();
        var csv = "a,b,c\n" + string.Concat(Enumerable.Repeat("1,2,3\n", 1000));

        // A stream of unknown length has no Content-Length, so the limit is checked while reading.
        using var content = new StreamContent(new UnknownLengthStream(Encoding.UTF8.GetBytes(csv)));
        content.Headers.ContentType = new MediaTypeHeaderValue("text/csv");
        using var response = await client.PostAsync(new Uri("/v1/distances", UriKind.Relative), content);
        await response.Problem(413, "/problems/too-large", "");
    }

    [Fact]
    public async Task ABodyJustUnderTheByteLimitIsRead()
    {
        using var factory = PartwiseFactory.WithLimits(("MaxBodyBytes", "2048"));
        using var client = factory.CreateClient();
        var json = "{\"parts\": " + Parts(3) + ", \"rows\": " + Rows(3, 3) + ", \"transform\": {\"type\": \"clr\"}}";
        json += new string(' ', 2048 - json.Length);
        using var response = await client.PostJson("/v1/coordinates", json);
        await response.OkJson();
    }

    [Theory]
    [InlineData("/v1/compositions/prepare")]
    [InlineData("/v1/coordinates")]
    [InlineData("/v1/summary")]
    [InlineData("/v1/distances")]
    public async Task MorePartsThanTheLimitIsA413AtParts(string path)
    {
        using var factory = PartwiseFactory.WithLimits(("MaxParts", "4"));
        using var client = factory.CreateClient();
        using var json = await client.PostJson(path, "{\"parts\": " + Parts(5) + ", \"rows\": " + Rows(2, 5) + ", \"transform\": {\"type\": \"clr\"}}");
        await json.Problem(413, "/problems/too-large", "/parts");
        using var csv = await client.PostCsv(path + "?transform=clr", "p0,p1,p2,p3,p4\n1,2,3,4,5\n");
        await csv.Problem(413, "/problems/too-large", "/parts");
    }

    [Theory]
    [InlineData("/v1/compositions/prepare")]
    [InlineData("/v1/coordinates")]
    [InlineData("/v1/summary")]
    [InlineData("/v1/distances")]
    public async Task MoreRowsThanTheLimitIsA413AtRows(string path)
    {
        using var factory = PartwiseFactory.WithLimits(("MaxRows", "3"));
        using var client = factory.CreateClient();
        using var json = await client.PostJson(path, "{\"parts\": " + Parts(2) + ", \"rows\": " + Rows(4, 2) + ", \"transform\": {\"type\": \"clr\"}}");
        await json.Problem(413, "/problems/too-large", "/rows");
        using var csv = await client.PostCsv(path + "?transform=clr", "a,b\n1,2\n1,2\n1,2\n1,2\n");
        await csv.Problem(413, "/problems/too-large", "/rows");
    }

    [Fact]
    public async Task InverseCountsItsPartsAndRowsAgainstTheLimits()
    {
        using var factory = PartwiseFactory.WithLimits(("MaxParts", "3"));
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/coordinates/inverse", "{\"parts\": " + Parts(4) + ", \"transform\": {\"type\": \"clr\"}, \"rows\": " + Rows(1, 4) + "}");
        await response.Problem(413, "/problems/too-large", "/parts");
    }

    [Fact]
    public async Task DistancesOverTheRowLimitAreA422ComputationLimit()
    {
        using var factory = PartwiseFactory.WithLimits(("MaxDistanceRows", "3"));
        using var client = factory.CreateClient();
        using var response = await client.PostJson("/v1/distances", "{\"parts\": " + Parts(2) + ", \"rows\": " + Rows(4, 2) + "}");
        await response.Problem(422, "/problems/computation-limit", "/rows");
        using var fits = await client.PostJson("/v1/distances", "{\"parts\": " + Parts(2) + ", \"rows\": " + Rows(3, 2) + "}");
        await fits.OkJson();
    }

    [Fact]
    public async Task DistancesDefaultLimitIsFiveThousandRows()
    {
        using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        var csv = new StringBuilder("a,b\n");
        for (var i = 0; i < 5001; i++)
        {
            csv.Append(1 + i).Append(",2\n");
        }

        using var response = await client.PostCsv("/v1/distances", csv.ToString());
        await response.Problem(422, "/problems/computation-limit", "/rows");
    }

    [Fact]
    public async Task AResultOverTheValueLimitIsA422ComputationLimit()
    {
        using var factory = PartwiseFactory.WithLimits(("MaxResultValues", "20"));
        using var client = factory.CreateClient();

        // 2 rows × 6 · 5 / 2 = 30 pairwise log-ratios > 20; the clr of the same table (12 values) fits.
        var table = "\"parts\": " + Parts(6) + ", \"rows\": " + Rows(2, 6);
        using var pairwise = await client.PostJson("/v1/coordinates", "{" + table + ", \"transform\": {\"type\": \"pairwise\"}}");
        await pairwise.Problem(422, "/problems/computation-limit", "/transform");
        using var clr = await client.PostJson("/v1/coordinates", "{" + table + ", \"transform\": {\"type\": \"clr\"}}");
        await clr.OkJson();
    }

    [Theory]
    [InlineData("MaxBodyBytes", "10")]
    [InlineData("MaxParts", "1")]
    [InlineData("MaxRows", "0")]
    [InlineData("MaxDistanceRows", "100000")]
    [InlineData("MaxResultValues", "0")]
    [InlineData("ComputeTimeoutSeconds", "-1")]
    [InlineData("ComputeTimeoutSeconds", "100000")]
    public void AnInvalidLimitStopsTheServiceAtStart(string name, string value)
    {
        // The host refuses to start. What the test host throws while it tears the failed host down varies (at
        // times an ObjectDisposedException), so the message is checked on the options themselves below.
        using var factory = PartwiseFactory.WithLimits((name, value));
        Assert.ThrowsAny<Exception>(() => factory.CreateClient());

        var configuration = new ConfigurationBuilder()
            .AddInMemoryCollection(new Dictionary<string, string?> { [$"{LimitsOptions.Section}:{name}"] = value })
            .Build();
        using var services = new ServiceCollection().AddPartwiseLimits(configuration).BuildServiceProvider();
        var error = Assert.Throws<OptionsValidationException>(() => services.GetRequiredService<IOptions<LimitsOptions>>().Value);
        Assert.Contains(name, error.Message, StringComparison.Ordinal);
    }

    private sealed class UnknownLengthStream(byte[] data) : MemoryStream(data)
    {
        public override bool CanSeek => false;

        public override long Length => throw new NotSupportedException();
    }
}
