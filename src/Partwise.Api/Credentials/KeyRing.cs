using Microsoft.Extensions.Options;

namespace Partwise.Api.Credentials;

/// <summary>The configured keys as digests, decoded once from the validated options.</summary>
public sealed class KeyRing
{
    private readonly Entry[] _entries;

    /// <summary>Decodes the configured hashes.</summary>
    public KeyRing(IOptions<CredentialsOptions> options)
    {
        ArgumentNullException.ThrowIfNull(options);
        _entries = [.. options.Value.Keys.Select(k => new Entry(k.Name, Convert.FromHexString(k.Sha256), Roles.Implied(k.Roles)))];
    }

    /// <summary>Whether any key is configured; without one only loopback callers are served.</summary>
    public bool IsEmpty => _entries.Length == 0;

    /// <summary>The configured keys' names (never their hashes), for the start-up log.</summary>
    public IReadOnlyList<string> Names => [.. _entries.Select(e => e.Name)];

    /// <summary>
    /// The holder of <paramref name="key"/>, or null. Every configured digest is compared, each in constant time, and
    /// the loop does not stop at a match, so the time taken says nothing about which key (if any) matched.
    /// </summary>
    public Holder? Find(string key)
    {
        var presented = KeyHash.Digest(key);
        Entry? found = null;
        foreach (var entry in _entries)
        {
            if (KeyHash.Matches(presented, entry.Digest))
            {
                found = entry;
            }
        }

        return found is null ? null : new Holder(found.Name, found.Roles);
    }

    private sealed record Entry(string Name, byte[] Digest, IReadOnlyList<string> Roles);
}

/// <summary>Who holds a key and the roles it grants (admin expanded to every role).</summary>
/// <param name="Name">The key's configured name.</param>
/// <param name="Roles">Its roles.</param>
public sealed record Holder(string Name, IReadOnlyList<string> Roles);
