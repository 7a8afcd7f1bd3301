using System.Security.Cryptography;
using System.Text;

namespace Partwise.Api.Credentials;

/// <summary>
/// The one way a key becomes what configuration stores: SHA-256 (FIPS 180-4) over the key's UTF-8 bytes, written
/// as 64 lowercase hexadecimal digits. A key is random (32 bytes from <c>hash-key</c>), so an unsalted fast hash
/// suffices: there is no dictionary to try.
/// </summary>
public static class KeyHash
{
    /// <summary>The length in bytes of a SHA-256 digest.</summary>
    public const int DigestBytes = 32;

    /// <summary>The SHA-256 of <paramref name="key"/>'s UTF-8 bytes.</summary>
    public static byte[] Digest(string key)
    {
        ArgumentNullException.ThrowIfNull(key);
        return SHA256.HashData(Encoding.UTF8.GetBytes(key));
    }

    /// <summary>The SHA-256 of <paramref name="key"/>'s UTF-8 bytes as 64 lowercase hexadecimal digits.</summary>
    public static string Hex(string key) => Convert.ToHexStringLower(Digest(key));

    /// <summary>Whether <paramref name="text"/> is 64 hexadecimal digits (either case).</summary>
    public static bool IsHexDigest(string? text) => text is { Length: DigestBytes * 2 } && text.All(char.IsAsciiHexDigit);

    /// <summary>
    /// Whether two digests are equal, in time that does not depend on where they first differ
    /// (<see cref="CryptographicOperations.FixedTimeEquals"/>), so a caller learns nothing from the time a refusal takes.
    /// </summary>
    public static bool Matches(ReadOnlySpan<byte> presented, ReadOnlySpan<byte> configured) =>
        CryptographicOperations.FixedTimeEquals(presented, configured);
}
