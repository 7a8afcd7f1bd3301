using System.Globalization;
using System.Text.Json;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Baselines;

/// <summary>Each test has its own host and store.</summary>
public class BiplotTests
{
    private static async Task<(PartwiseFactory Factory, HttpClient Client, string BaselineId)> Start(string name = "biplot")
    {
        var factory = new PartwiseFactory();
        var client = factory.CreateClient();
        var id = (await BaselineBodies.Create(client, BaselineBodies.Request(name))).GetProperty("id").GetString()!;
        return (factory, client, id);
    }

    private static async Task<string> Flag(HttpClient client, string baselineId, string sampleId, double a = 9)
    {
        var result = (await BaselineBodies.Screen(client, baselineId, "{\"sample\": " + BaselineBodies.Sample(sampleId, a, 1, 1) + "}")).GetProperty("results")[0];
        Assert.True(result.GetProperty("flagged").GetBoolean());
        return result.GetProperty("flagId").GetString()!;
    }

    private static Task<HttpResponseMessage> Biplot(HttpClient client, string baselineId, string query = "") =>
        client.GetAsync(new Uri($"/v1/baselines/{baselineId}/biplot{query}", UriKind.Relative));

    [Fact]
    public async Task AFlaggedSampleIsPlacedWhereItsSquaredDistanceComesOut()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var flag = await Flag(client, baseline, "s-1");

        using var response = await Biplot(client, baseline, "?flags=" + flag);
        var biplot = await response.OkJson();
        Assert.Equal(["a", "b", "c"], biplot.GetProperty("parts").EnumerateArray().Select(p => p.GetString()));
        Assert.Equal(2, biplot.GetProperty("dimensions").GetInt32());
        var variances = biplot.GetProperty("variances").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        Assert.Equal(2, variances.Length); // three parts: p = 2, so the plane holds everything
        Tolerance.Close(biplot.GetProperty("totalVariance").GetDouble(), variances.Sum(), 1e-12, 1e-12);
        var sample = biplot.GetProperty("samples")[0];
        Assert.Equal(flag, sample.GetProperty("flagId").GetString());
        Assert.Equal("s-1", sample.GetProperty("sampleId").GetString());
        Assert.Equal("open", sample.GetProperty("status").GetString());
        var scores = sample.GetProperty("scores").EnumerateArray().Select(v => v.GetDouble()).ToArray();

        // Σ s_k²/λ_k is d², by hand from the tiny baseline's moments (BaselineBodies.HandSquaredDistance).
        var expected = BaselineBodies.HandSquaredDistance(9, 1, 1);
        Tolerance.Close(expected, (scores[0] * scores[0] / variances[0]) + (scores[1] * scores[1] / variances[1]), 1e-9, 1e-9, "Σ s²/λ");
        Tolerance.Close(expected, sample.GetProperty("squaredDistance").GetDouble(), 1e-9, 1e-9, "d²");
        Tolerance.Close(expected, sample.GetProperty("planeSquaredDistance").GetDouble(), 1e-9, 1e-9, "plane d²");

        var ellipse = biplot.GetProperty("ellipse");
        var threshold = ellipse.GetProperty("threshold").GetDouble();
        var semi = ellipse.GetProperty("semiAxes").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        Tolerance.Close(Math.Sqrt(threshold * variances[0]), semi[0], 1e-12, 1e-12, "semi-axis 1");
        Assert.Equal(3, biplot.GetProperty("partCoordinates").GetArrayLength());
    }

    [Fact]
    public async Task WithoutFlagsTheBiplotHasNoSamplesAndTheFlagListingCarriesTheValues()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        await Flag(client, baseline, "s-2");

        using var response = await Biplot(client, baseline);
        Assert.Equal(0, (await response.OkJson()).GetProperty("samples").GetArrayLength());
        using var flags = await client.GetAsync(new Uri("/v1/flags", UriKind.Relative));
        var values = (await flags.OkJson()).GetProperty("items")[0].GetProperty("values");
        Assert.Equal(9, values.GetProperty("a").GetDouble());
        Assert.Equal(1, values.GetProperty("c").GetDouble());
    }

    [Theory]
    [InlineData("?flags=x,,y", "/flags/1")]
    [InlineData("?flags=", "/flags/0")]
    [InlineData("?flags=x,x", "/flags/1")]
    [InlineData("?flags=x&flags=x", "/flags/1")]
    public async Task BadFlagListsAre400sPointingAtTheItem(string query, string pointer)
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        using var response = await Biplot(client, baseline, query);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task MoreThanAHundredFlagsIsA400AtTheList()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var ids = string.Join(",", Enumerable.Range(0, 101).Select(i => i.ToString(CultureInfo.InvariantCulture)));
        using var response = await Biplot(client, baseline, "?flags=" + ids);
        await response.Problem(400, "/problems/invalid-input", "/flags");
    }

    [Fact]
    public async Task AnUnknownFlagIsA404AtItsPlaceAndAnUnknownBaselineA404()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var flag = await Flag(client, baseline, "s-3");
        using var unknown = await Biplot(client, baseline, $"?flags={flag},no-such-flag");
        await unknown.Problem(404, "/problems/not-found", "/flags/1");
        using var noBaseline = await Biplot(client, "no-such-baseline");
        await noBaseline.Problem(404, "/problems/not-found");
    }

    [Fact]
    public async Task AFlagOfAnotherBaselineIsA404AtItsPlace()
    {
        var (factory, client, baseline) = await Start();
        await using var _ = factory;
        using var __ = client;
        var other = (await BaselineBodies.Create(client, BaselineBodies.Request("other"))).GetProperty("id").GetString()!;
        var flag = await Flag(client, other, "s-4");
        using var response = await Biplot(client, baseline, "?flags=" + flag);
        await response.Problem(404, "/problems/not-found", "/flags/0");
    }
}
