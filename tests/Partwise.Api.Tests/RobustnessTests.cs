using System.Text;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests;

/// <summary>
/// No caller input produces a 500: seeded random mutations of valid requests (deleted, inserted and replaced
/// characters) are posted to every endpoint, and every answer must be a 2xx or a 4xx problem document.
/// </summary>
public class RobustnessTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Table = "\"parts\": [\"Ca\", \"Mg\", \"Na\", \"Cl\"], \"rows\": [[31.9, 8.1, 0, 17.9], [28.4, 7.6, 11.8, 16.1], [44.7, 12.9, 61.3, 98.4]], \"ids\": [\"w1\", \"w2\", \"w3\"], " +
        "\"zeros\": {\"method\": \"multiplicative\", \"detectionLimits\": {\"Na\": 0.5}, \"fraction\": 0.65}";

    public static TheoryData<string, string> Requests => new()
    {
        { "/v1/compositions/prepare", "{" + Table + ", \"total\": 100}" },
        { "/v1/coordinates", "{" + Table + ", \"transform\": {\"type\": \"ilr\", \"partition\": [[1, 1, -1, -1], [1, -1, 0, 0], [0, 0, 1, -1]]}}" },
        { "/v1/coordinates", "{" + Table + ", \"transform\": {\"type\": \"ratios\", \"ratios\": [{\"num\": [\"Na\"], \"den\": [\"Cl\"]}, {\"num\": [\"Ca\", \"Mg\"], \"den\": [\"Na\"], \"kind\": \"amalgamation\"}]}}" },
        { "/v1/coordinates", "{" + Table + ", \"transform\": {\"type\": \"clr\", \"weights\": {\"Ca\": 1, \"Mg\": 2, \"Na\": 1, \"Cl\": 1}}}" },
        { "/v1/coordinates/inverse", "{\"parts\": [\"Ca\", \"Mg\", \"Na\", \"Cl\"], \"transform\": {\"type\": \"alr\", \"denominator\": \"Cl\"}, \"rows\": [[0.5, -0.7, -0.3]], \"total\": 100}" },
        { "/v1/summary", "{" + Table + ", \"weights\": \"mean\"}" },
        { "/v1/distances", "{" + Table + "}" },
    };

    private const string Alphabet = "{}[],:\"0123456789.-+eE \\nulltrueNaNabc/";

    [Theory]
    [MemberData(nameof(Requests))]
    public async Task MutatedJsonNeverGivesA500(string path, string valid)
    {
        using var client = factory.CreateClient();
        using (var ok = await client.PostJson(path, valid))
        {
            await ok.OkJson();
        }

        var random = new Random(path.Length * 7919 + valid.Length);
        for (var trial = 0; trial < 150; trial++)
        {
            var body = Mutate(valid, random, 1 + random.Next(4));
            using var response = await client.PostJson(path, body);
            await AssertAnswered(response, body);
        }
    }

    [Theory]
    [InlineData("/v1/compositions/prepare", "?zeros=multiplicative&detectionLimit=0.5&total=100")]
    [InlineData("/v1/coordinates", "?transform=ilr&zeros=multiplicative&detectionLimit=0.5")]
    [InlineData("/v1/summary", "?zeros=bayesian-multiplicative&prior=perks")]
    [InlineData("/v1/distances", "?zeros=multiplicative&detectionLimit.Na=0.5")]
    public async Task MutatedCsvNeverGivesA500(string path, string query)
    {
        using var client = factory.CreateClient();
        const string valid = "id,Ca,Mg,Na,Cl\nw1,31,8,0,17\nw2,28,7,11,16\nw3,44,12,61,98\n";
        var random = new Random(path.Length * 31 + query.Length);
        for (var trial = 0; trial < 150; trial++)
        {
            var body = Mutate(valid, random, 1 + random.Next(4));
            using var response = await client.PostCsv(path + query, body, trial % 2 == 0 ? "text/csv" : null);
            await AssertAnswered(response, body);
        }
    }

    [Fact]
    public async Task RandomBytesNeverGiveA500()
    {
        using var client = factory.CreateClient();
        var random = new Random(20260402);
        string[] paths = ["/v1/compositions/prepare", "/v1/coordinates", "/v1/coordinates/inverse", "/v1/summary", "/v1/distances"];
        for (var trial = 0; trial < 100; trial++)
        {
            var bytes = new byte[random.Next(0, 300)];
            random.NextBytes(bytes);
            foreach (var type in new[] { "application/json", "text/csv" })
            {
                using var content = new ByteArrayContent(bytes);
                content.Headers.ContentType = new System.Net.Http.Headers.MediaTypeHeaderValue(type);
                using var response = await client.PostAsync(new Uri(paths[trial % paths.Length] + "?transform=clr&parts=a,b", UriKind.Relative), content);
                await AssertAnswered(response, Convert.ToBase64String(bytes));
            }
        }
    }

    private static async Task AssertAnswered(HttpResponseMessage response, string body)
    {
        var status = (int)response.StatusCode;
        Assert.True(status < 500, $"{status} for body: {body}\n{await response.Content.ReadAsStringAsync()}");
        Assert.True(response.Headers.Contains("X-Request-Id"));
        if (status >= 400)
        {
            Assert.Equal("application/problem+json", response.Content.Headers.ContentType?.MediaType);
        }
    }

    private static string Mutate(string text, Random random, int edits)
    {
        var s = new StringBuilder(text);
        for (var e = 0; e < edits && s.Length > 0; e++)
        {
            var at = random.Next(s.Length);
            switch (random.Next(3))
            {
                case 0:
                    s.Remove(at, 1);
                    break;
                case 1:
                    s.Insert(at, Alphabet[random.Next(Alphabet.Length)]);
                    break;
                default:
                    s[at] = Alphabet[random.Next(Alphabet.Length)];
                    break;
            }
        }

        return s.ToString();
    }
}
