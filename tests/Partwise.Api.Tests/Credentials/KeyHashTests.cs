using Partwise.Api.Credentials;

namespace Partwise.Api.Tests.Credentials;

public class KeyHashTests
{
    [Theory]
    // FIPS 180-2, Appendix B.1 and B.2 (one-block and two-block messages).
    [InlineData("abc", "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad")]
    [InlineData("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1")]
    // Non-ASCII characters hash as their UTF-8 bytes: value from Python's hashlib.sha256('Brunnen-ü-€'.encode('utf-8')).
    [InlineData("Brunnen-ü-€", "de6bfd45f4cd2c2211678edf02b927d0642edde007559ed4a9e23803507d800b")]
    public void TheHashIsLowercaseHexOfSha256OverUtf8(string key, string expected) =>
        Assert.Equal(expected, KeyHash.Hex(key));

    [Theory]
    [InlineData("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", true)]
    [InlineData("BA7816BF8F01CFEA414140DE5DAE2223B00361A396177A9CB410FF61F20015AD", true)]
    [InlineData("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015a", false)]
    [InlineData("ga7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", false)]
    [InlineData("", false)]
    public void ADigestIs64HexDigits(string text, bool valid) => Assert.Equal(valid, KeyHash.IsHexDigest(text));

    [Fact]
    public void DigestsMatchOnlyWhenEqual()
    {
        var a = KeyHash.Digest("abc");
        var b = KeyHash.Digest("abd");
        Assert.True(KeyHash.Matches(a, KeyHash.Digest("abc")));
        Assert.False(KeyHash.Matches(a, b));
        Assert.False(KeyHash.Matches(a, a.AsSpan(0, 31)));
    }
}
