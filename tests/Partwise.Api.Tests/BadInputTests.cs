using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests;

/// <summary>Every kind of bad input the contract names: status, problem type and the pointer to the offending place.</summary>
public class BadInputTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private const string Coordinates = "/v1/coordinates";
    private const string Clr = "\"transform\": {\"type\": \"clr\"}";

    public static TheoryData<string> TableEndpoints => new() { "/v1/compositions/prepare", "/v1/coordinates", "/v1/summary", "/v1/distances" };

    private static string Table(string rows, string options = Clr, string parts = "[\"a\", \"b\", \"c\"]") =>
        "{\"parts\": " + parts + ", \"rows\": " + rows + (options.Length == 0 ? "" : ", " + options) + "}";

    private async Task<HttpResponseMessage> Post(string json, string path = Coordinates)
    {
        using var client = factory.CreateClient();
        return await client.PostJson(path, json);
    }

    [Theory]
    [InlineData("{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3], [3 4 5]]}", "/rows/1/1")]
    [InlineData("{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3], [3, 4, 5]]", "")]
    [InlineData("{\"parts\": [\"a\", \"b\", \"c\"] \"rows\": []}", "")]
    [InlineData("{\"parts\": [\"a\", \"b\", \"c\"], \"rows\": [[1, 2, 3,]]}", "/rows/0/3")]
    [InlineData("{parts: [\"a\", \"b\"]}", "")]
    [InlineData("", "")]
    [InlineData("null", "")]
    [InlineData("[]", "")]
    [InlineData("\"text\"", "")]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]]} trailing", "")]
    public async Task MalformedJsonIsA400PointingAtTheOffendingPlace(string body, string pointer)
    {
        // The pointer names where the reader stopped: the value after a missing comma, or the whole document when
        // the syntax breaks between members or at the end.
        using var response = await Post(body);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Theory]
    [InlineData("NaN")]
    [InlineData("Infinity")]
    [InlineData("-Infinity")]
    [InlineData("1e400")]
    [InlineData("-1e309")]
    public async Task NonFiniteNumbersAreA400PointingAtTheCell(string literal)
    {
        using var response = await Post(Table("[[1, 2, 3], [4, 5, " + literal + "]]"));
        await response.Problem(400, "/problems/invalid-input", "/rows/1/2");
    }

    [Theory]
    [InlineData("[[1, \"2\", 3]]", "/rows/0/1")]
    [InlineData("[[1, true, 3]]", "/rows/0/1")]
    [InlineData("[[1, null, 3]]", "/rows/0/1")]
    [InlineData("[[1, [2], 3]]", "/rows/0/1")]
    [InlineData("[1, 2, 3]", "/rows/0")]
    [InlineData("{\"a\": 1}", "/rows")]
    [InlineData("\"1,2,3\"", "/rows")]
    public async Task WrongJsonTypesInRowsAreA400AtTheirPlace(string rows, string pointer)
    {
        using var response = await Post(Table(rows));
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Theory]
    [InlineData("\"a,b,c\"", "/parts")]
    [InlineData("[\"a\", 2, \"c\"]", "/parts/1")]
    [InlineData("{\"a\": 1}", "/parts")]
    public async Task WrongJsonTypesInPartsAreA400AtTheirPlace(string parts, string pointer)
    {
        using var response = await Post(Table("[[1, 2, 3]]", Clr, parts));
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task ADuplicateMemberIsA400()
    {
        using var response = await Post("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]], \"rows\": [[3, 4]], " + Clr + "}");
        await response.Problem(400, "/problems/invalid-input", "/rows");
    }

    [Fact]
    public async Task NestingBeyondTheDepthLimitIsA400()
    {
        var deep = new string('[', 200) + new string(']', 200);
        using var response = await Post("{\"parts\": [\"a\", \"b\"], \"extra\": " + deep + "}");
        await response.Problem(400, "/problems/invalid-input");
    }

    [Theory]
    [MemberData(nameof(TableEndpoints))]
    public async Task ANegativeValueIsA422PointingAtTheCell(string path)
    {
        using var response = await Post(Table("[[1, 2, 3], [4, -5, 6]]"), path);
        await response.Problem(422, "/problems/negative-value", "/rows/1/1");
    }

    [Theory]
    [MemberData(nameof(TableEndpoints))]
    public async Task ZeroUnderRejectPolicyIsA422PointingAtTheCell(string path)
    {
        using var response = await Post(Table("[[1, 2, 3], [4, 5, 6], [7, 8, 0]]"), path);
        await response.Problem(422, "/problems/zero-value", "/rows/2/2");
    }

    [Fact]
    public async Task ZeroUnderAnExplicitRejectPolicyIsA422PointingAtEveryCell()
    {
        using var response = await Post(Table("[[0, 2, 3], [4, 0, 6]]", Clr + ", \"zeros\": {\"method\": \"reject\"}"));
        var problem = await response.Problem(422, "/problems/zero-value", "/rows/0/0");
        Assert.Contains(problem.GetProperty("errors").EnumerateArray(), e => e.GetProperty("pointer").GetString() == "/rows/1/1");
    }

    [Theory]
    [MemberData(nameof(TableEndpoints))]
    public async Task ARaggedRowIsA400AtTheRow(string path)
    {
        using var response = await Post(Table("[[1, 2, 3], [4, 5]]"), path);
        await response.Problem(400, "/problems/invalid-input", "/rows/1");
    }

    [Fact]
    public async Task ANullRowIsA400AtTheRow()
    {
        using var response = await Post(Table("[[1, 2, 3], null]"));
        await response.Problem(400, "/problems/invalid-input", "/rows/1");
    }

    [Fact]
    public async Task NoRowsIsA400()
    {
        using var response = await Post(Table("[]"));
        await response.Problem(400, "/problems/invalid-input", "/rows");
    }

    [Theory]
    [InlineData("[\"a\", \"b\", \"a\"]", "/parts/2")]
    [InlineData("[\"a\", \"\", \"c\"]", "/parts/1")]
    [InlineData("[\"a\", \"  \", \"c\"]", "/parts/1")]
    [InlineData("[\"a\", null, \"c\"]", "/parts/1")]
    public async Task DuplicateOrEmptyPartNamesAreA400AtTheName(string parts, string pointer)
    {
        using var response = await Post(Table("[[1, 2, 3]]", Clr, parts));
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Theory]
    [MemberData(nameof(TableEndpoints))]
    public async Task ASinglePartIsA400(string path)
    {
        using var response = await Post(Table("[[1]]", Clr, "[\"a\"]"), path);
        await response.Problem(400, "/problems/invalid-input", "/parts");
    }

    [Theory]
    [InlineData("{\"rows\": [[1, 2]], \"transform\": {\"type\": \"clr\"}}", "/parts")]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"transform\": {\"type\": \"clr\"}}", "/rows")]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]]}", "/transform")]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]], \"transform\": {}}", "/transform/type")]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]], \"transform\": {\"type\": \"lrc\"}}", "/transform/type")]
    [InlineData("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]], \"transform\": \"clr\"}", "/transform")]
    public async Task MissingOrUnknownRequiredMembersAreA400(string body, string pointer)
    {
        using var response = await Post(body);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Theory]
    [InlineData("[\"w1\", \"w1\"]", "/ids/1")]
    [InlineData("[\"w1\"]", "/ids")]
    [InlineData("[\"w1\", \"\"]", "/ids/1")]
    public async Task BadIdsAreA400(string ids, string pointer)
    {
        using var response = await Post("{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2], [3, 4]], \"ids\": " + ids + ", " + Clr + "}");
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Theory]
    [InlineData("{\"detectionLimits\": 0.1}", 400, "/problems/invalid-input", "/zeros/method")]
    [InlineData("{\"method\": \"drop\"}", 400, "/problems/invalid-input", "/zeros/method")]
    [InlineData("{\"method\": \"bayesian-multiplicative\"}", 400, "/problems/invalid-input", "/zeros/prior")]
    [InlineData("{\"method\": \"bayesian-multiplicative\", \"prior\": \"flat\"}", 400, "/problems/invalid-input", "/zeros/prior")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": \"low\"}", 400, "/problems/invalid-input", "/zeros/detectionLimits")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": {\"a\": \"0.1\"}}", 400, "/problems/invalid-input", "/zeros/detectionLimits")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": {\"Cl\": 0.1}}", 422, "/problems/unknown-part", "/zeros/detectionLimits/Cl")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": {\"a/b\": 0.1}}", 422, "/problems/unknown-part", "/zeros/detectionLimits/a~1b")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": {\"b\": 0.1}}", 422, "/problems/invalid-zero-policy", "/rows/0/0")]
    [InlineData("{\"method\": \"multiplicative\"}", 422, "/problems/invalid-zero-policy", "/rows/0/0")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": -1}", 422, "/problems/invalid-zero-policy", "/zeros/detectionLimits")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": 0.1, \"fraction\": 1.5}", 422, "/problems/invalid-zero-policy", "/zeros/fraction")]
    [InlineData("{\"method\": \"multiplicative\", \"detectionLimits\": 100}", 422, "/problems/invalid-zero-policy", "/rows/0")]
    [InlineData("{\"method\": \"bayesian-multiplicative\", \"prior\": \"jeffreys\"}", 422, "/problems/invalid-zero-policy", "/rows/0/1")]
    public async Task BadZeroPoliciesPointAtTheirMember(string zeros, int status, string type, string pointer)
    {
        using var response = await Post(Table("[[0, 2.5, 3]]", Clr + ", \"zeros\": " + zeros));
        await response.Problem(status, type, pointer);
    }

    [Fact]
    public async Task AnAlrDenominatorNotInTheTableIsA422()
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"transform\": {\"type\": \"alr\", \"denominator\": \"Cl\"}"));
        await response.Problem(422, "/problems/unknown-part", "/transform/denominator");
    }

    [Theory]
    [InlineData("[[1, 1, -1]]", "/transform/partition")]
    [InlineData("[[1, 1, -1], [1, 0, -1]]", "/transform/partition/1")]
    [InlineData("[[1, -1, 0], [1, 0, -1]]", "/transform/partition/0")]
    [InlineData("[[1, 1, -1], [1, -1]]", "/transform/partition/1")]
    [InlineData("[[1, 1, -1], [2, -1, 0]]", "/transform/partition/1/0")]
    [InlineData("[[1, 1, 1], [1, -1, 0]]", "/transform/partition/0")]
    public async Task APartitionThatIsNotASequentialBinaryPartitionIsA422(string partition, string pointer)
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"transform\": {\"type\": \"ilr\", \"partition\": " + partition + "}"));
        await response.Problem(422, "/problems/invalid-partition", pointer);
    }

    [Fact]
    public async Task APartitionWithFractionalSignsIsA400()
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"transform\": {\"type\": \"ilr\", \"partition\": [[1, 1, -0.5], [1, -1, 0]]}"));
        await response.Problem(400, "/problems/invalid-input", "/transform/partition/0/2");
    }

    [Theory]
    [InlineData("{\"num\": [\"a\"], \"den\": [\"Cl\"]}", 422, "/problems/unknown-part", "/transform/ratios/0/den/0")]
    [InlineData("{\"num\": [\"a\", \"b\"], \"den\": [\"b\"], \"kind\": \"amalgamation\"}", 422, "/problems/invalid-ratio", "/transform/ratios/0")]
    [InlineData("{\"num\": [\"a\", \"b\"], \"den\": [\"c\"]}", 422, "/problems/invalid-ratio", "/transform/ratios/0/kind")]
    [InlineData("{\"num\": [\"a\", \"b\"], \"den\": [\"c\"], \"kind\": \"pairwise\"}", 422, "/problems/invalid-ratio", "/transform/ratios/0/kind")]
    [InlineData("{\"num\": [], \"den\": [\"c\"]}", 422, "/problems/invalid-ratio", "/transform/ratios/0/num")]
    [InlineData("{\"num\": [\"a\"], \"den\": [\"c\"], \"kind\": \"sum\"}", 400, "/problems/invalid-input", "/transform/ratios/0/kind")]
    [InlineData("{\"den\": [\"c\"]}", 400, "/problems/invalid-input", "/transform/ratios/0/num")]
    [InlineData("null", 400, "/problems/invalid-input", "/transform/ratios/0")]
    public async Task BadRatiosPointAtTheRatio(string ratio, int status, string type, string pointer)
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"transform\": {\"type\": \"ratios\", \"ratios\": [" + ratio + "]}"));
        await response.Problem(status, type, pointer);
    }

    [Fact]
    public async Task OverlappingNumeratorAndDenominatorIsA422()
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"transform\": {\"type\": \"ratios\", \"ratios\": [{\"num\": [\"a\"], \"den\": [\"b\"]}, {\"num\": [\"a\", \"c\"], \"den\": [\"c\"], \"kind\": \"balance\"}]}"));
        await response.Problem(422, "/problems/invalid-ratio", "/transform/ratios/1");
    }

    [Fact]
    public async Task AnEmptyRatioListIsA400()
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"transform\": {\"type\": \"ratios\", \"ratios\": []}"));
        await response.Problem(400, "/problems/invalid-input", "/transform/ratios");
    }

    [Fact]
    public async Task ANonPositiveTotalIsA422()
    {
        using var response = await Post(Table("[[1, 2, 3]]", "\"total\": -1"), "/v1/compositions/prepare");
        await response.Problem(422, "/problems/invalid-option", "/total");
    }

    [Theory]
    [InlineData("text/plain")]
    [InlineData("application/xml")]
    [InlineData("application/x-www-form-urlencoded")]
    [InlineData("multipart/form-data; boundary=x")]
    [InlineData(null)]
    public async Task AWrongContentTypeIsA415(string? contentType)
    {
        using var client = factory.CreateClient();
        using var response = await client.Post(Coordinates, Table("[[1, 2, 3]]"), contentType);
        await response.Problem(415, "/problems/unsupported-media-type", "");
    }

    [Theory]
    [InlineData("id,a,b,c\nw1,1,2,3\nw2,4,5\n", "/rows/1")]
    [InlineData("a,b,c\n1,2,3\n4,5,6,7\n", "/rows/1")]
    [InlineData("a,b,c\n1,2,3\n4,x,6\n", "/rows/1/1")]
    [InlineData("a,b,c\n1,2,NaN\n", "/rows/0/2")]
    [InlineData("a,b,c\n1,Infinity,3\n", "/rows/0/1")]
    [InlineData("a,b,c\n1,1e400,3\n", "/rows/0/1")]
    [InlineData("a,b,c\n1,,3\n", "/rows/0/1")]
    [InlineData("a,b,c\n1,\"2,5\",3\n", "/rows/0/1")]
    [InlineData("id,a,b\nw1,1,2\nw1,3,4\n", "/ids/1")]
    [InlineData("a,b,a\n1,2,3\n", "/parts/2")]
    [InlineData("a,,c\n1,2,3\n", "/parts/1")]
    [InlineData("a\n1\n", "/parts")]
    [InlineData("a,b,c\n", "/rows")]
    [InlineData("", "")]
    [InlineData("\n\n", "")]
    public async Task BadCsvIsA400PointingAtTheOffendingPlace(string csv, string pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Coordinates + "?transform=clr", csv);
        await response.Problem(400, "/problems/invalid-input", pointer);
    }

    [Fact]
    public async Task CsvThatIsNotUtf8IsA400()
    {
        using var client = factory.CreateClient();
        using var content = new ByteArrayContent([0x61, 0x2C, 0x62, 0x0A, 0xFF, 0xFE, 0x2C, 0x31, 0x0A]);
        content.Headers.ContentType = new System.Net.Http.Headers.MediaTypeHeaderValue("text/csv");
        using var response = await client.PostAsync(new Uri(Coordinates + "?transform=clr", UriKind.Relative), content);
        await response.Problem(400, "/problems/invalid-input", "");
    }

    [Theory]
    [InlineData("?transform=clr&zeros=multiplicative&fraction=abc", 400, "/problems/invalid-input", "/zeros/fraction")]
    [InlineData("?transform=clr&zeros=multiplicative&fraction=0,65", 400, "/problems/invalid-input", "/zeros/fraction")]
    [InlineData("?transform=clr&zeros=multiplicative&detectionLimit=NaN", 400, "/problems/invalid-input", "/zeros/detectionLimits")]
    [InlineData("?transform=clr&zeros=multiplicative&detectionLimit.NO3=0.1", 422, "/problems/unknown-part", "/zeros/detectionLimits/NO3")]
    [InlineData("?transform=clr&total=1&total=2", 200, null, null)]
    [InlineData("?transform=ratios", 400, "/problems/invalid-input", "/transform/ratios")]
    [InlineData("?transform=clr&transform=alr", 400, "/problems/invalid-input", "/transform/type")]
    [InlineData("", 400, "/problems/invalid-input", "/transform")]
    [InlineData("?transform=alr&denominator=Cl", 422, "/problems/unknown-part", "/transform/denominator")]
    [InlineData("?transform=clr&zeros=nope", 400, "/problems/invalid-input", "/zeros/method")]
    [InlineData("?transform=clr&prior=perks", 400, "/problems/invalid-input", "/zeros/method")]
    public async Task BadQueryOptionsOfCsvRequestsPointAtTheirJsonPlace(string query, int status, string? type, string? pointer)
    {
        using var client = factory.CreateClient();
        using var response = await client.PostCsv(Coordinates + query, "a,b,c\n1,2,3\n");
        if (type is null)
        {
            // `total` is not an option of this endpoint, so it is ignored like an unknown JSON member.
            await response.OkJson();
            return;
        }

        await response.Problem(status, type, pointer);
    }
}
