using System.Buffers.Binary;
using System.Buffers.Text;
using System.Security.Cryptography;

namespace Partwise.Storage.Flags;

/// <summary>
/// A position in the flag listing: "after the flag with this sequence number". Its text form is opaque to callers:
/// base64url (RFC 4648 §5, no padding) of a format byte, the sequence number (64-bit big-endian) and the first four
/// bytes of a SHA-256 over both. The check bytes make a damaged or hand-edited cursor detectable (the host answers
/// 400); they are not a secret, and need not be: a forged cursor only moves the caller within flags it may read.
/// </summary>
public readonly record struct FlagCursor
{
    private const byte Format = 1;
    private const int PayloadLength = 9;
    private const int CheckLength = 4;
    private static readonly byte[] Domain = "partwise/flag-cursor"u8.ToArray();

    /// <summary>A cursor after the flag with sequence number <paramref name="sequence"/> (0 or more).</summary>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="sequence"/> is negative.</exception>
    public FlagCursor(long sequence)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(sequence);
        Sequence = sequence;
    }

    /// <summary>The sequence number of the last flag already seen; a listing resumes with the next greater one.</summary>
    public long Sequence { get; }

    /// <summary>The opaque text form (18 characters of base64url).</summary>
    public override string ToString()
    {
        Span<byte> bytes = stackalloc byte[PayloadLength + CheckLength];
        bytes[0] = Format;
        BinaryPrimitives.WriteInt64BigEndian(bytes[1..PayloadLength], Sequence);
        Check(bytes[..PayloadLength]).CopyTo(bytes[PayloadLength..]);
        return Base64Url.EncodeToString(bytes);
    }

    /// <summary>
    /// Reads the text form of a cursor. False, with no exception, for anything that <see cref="ToString"/> did not
    /// produce: null, empty, not base64url, the wrong length or format, a negative sequence, check bytes that do not match.
    /// </summary>
    public static bool TryParse(string? text, out FlagCursor cursor)
    {
        cursor = default;
        // Checked before decoding: the decoder throws rather than answer false on characters outside the alphabet.
        if (string.IsNullOrEmpty(text) || text.Length > 32
            || !Base64Url.IsValid(text, out var length) || length != PayloadLength + CheckLength)
        {
            return false;
        }

        Span<byte> bytes = stackalloc byte[PayloadLength + CheckLength];
        var written = Base64Url.DecodeFromChars(text, bytes);

        var payload = bytes[..PayloadLength];
        var sequence = BinaryPrimitives.ReadInt64BigEndian(payload[1..]);
        if (payload[0] != Format || sequence < 0 || !Check(payload).SequenceEqual(bytes[PayloadLength..written]))
        {
            return false;
        }

        // Base64url has more than one spelling of the same bytes (unused low bits); accept only the canonical one.
        cursor = new FlagCursor(sequence);
        return string.Equals(cursor.ToString(), text, StringComparison.Ordinal);
    }

    private static byte[] Check(ReadOnlySpan<byte> payload)
    {
        var input = new byte[Domain.Length + payload.Length];
        Domain.CopyTo(input, 0);
        payload.CopyTo(input.AsSpan(Domain.Length));
        return SHA256.HashData(input)[..CheckLength];
    }
}
