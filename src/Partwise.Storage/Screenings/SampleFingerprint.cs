using System.Buffers.Binary;
using System.Security.Cryptography;
using System.Text;

namespace Partwise.Storage.Screenings;

/// <summary>
/// The fingerprint that tells a repeated sample from a different one under the same id: SHA-256 (FIPS 180-4) of a
/// canonical serialisation of the sample's values, as 64 lowercase hex digits.
/// </summary>
public static class SampleFingerprint
{
    /// <summary>
    /// Canonical serialisation: the parts in ordinal (byte-wise UTF-16) order of their names; for each part, the
    /// length of its UTF-8 name as a 32-bit big-endian integer, the UTF-8 name, then the value as an IEEE 754
    /// binary64 in big-endian byte order, with −0 written as +0. The order the parts were given in does not matter;
    /// a value differing in its last bit does, and so does a part added or left out. 31.9 and 31.90 are the same
    /// double, so the same fingerprint.
    /// </summary>
    /// <exception cref="ArgumentException">A name is null or empty, a name repeats, or a value is NaN or infinite.</exception>
    public static string Compute(IEnumerable<KeyValuePair<string, double>> values)
    {
        ArgumentNullException.ThrowIfNull(values);
        var parts = values.ToList();
        parts.Sort((a, b) => string.CompareOrdinal(a.Key, b.Key));

        using var hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        Span<byte> number = stackalloc byte[8];
        for (var i = 0; i < parts.Count; i++)
        {
            var (name, value) = (parts[i].Key, parts[i].Value);
            if (string.IsNullOrEmpty(name))
            {
                throw new ArgumentException("A part name is empty.", nameof(values));
            }

            if (i > 0 && string.Equals(parts[i - 1].Key, name, StringComparison.Ordinal))
            {
                throw new ArgumentException($"The part '{name}' appears twice.", nameof(values));
            }

            if (!double.IsFinite(value))
            {
                throw new ArgumentException($"The value of '{name}' is not a finite number.", nameof(values));
            }

            var nameBytes = Encoding.UTF8.GetBytes(name);
            BinaryPrimitives.WriteInt32BigEndian(number, nameBytes.Length);
            hash.AppendData(number[..4]);
            hash.AppendData(nameBytes);
            // Adding 0.0 turns −0 into +0 (IEEE 754 §6.3) and leaves every other value as it is.
            BinaryPrimitives.WriteDoubleBigEndian(number, value + 0.0);
            hash.AppendData(number);
        }

        return Convert.ToHexStringLower(hash.GetHashAndReset());
    }
}
