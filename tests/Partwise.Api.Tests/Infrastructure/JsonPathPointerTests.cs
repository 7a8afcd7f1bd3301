using Partwise.Api.Infrastructure;

namespace Partwise.Api.Tests.Infrastructure;

public class JsonPathPointerTests
{
    [Theory]
    [InlineData("$", "")]
    [InlineData(null, "")]
    [InlineData("$.rows[3][5]", "/rows/3/5")]
    [InlineData("$.zeros.detectionLimits.NO3", "/zeros/detectionLimits/NO3")]
    [InlineData("$.zeros.detectionLimits['a b']", "/zeros/detectionLimits/a b")]
    [InlineData("$.weights['x.y']", "/weights/x.y")]
    [InlineData("$.weights['a/b~c']", "/weights/a~1b~0c")]
    [InlineData("$.weights['it's']", "/weights/it's")]
    [InlineData("$.weights['k[0]'].x", "/weights/k[0]/x")]
    [InlineData("$.transform.ratios[0].num[1]", "/transform/ratios/0/num/1")]
    public void JsonPathBecomesAnRfc6901Pointer(string? path, string pointer) =>
        Assert.Equal(pointer, JsonPathPointer.ToPointer(path));
}
