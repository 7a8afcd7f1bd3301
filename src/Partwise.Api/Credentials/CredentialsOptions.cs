namespace Partwise.Api.Credentials;

/// <summary>
/// The keys the service accepts, bound from <c>Partwise:Credentials</c>. Only SHA-256 hashes of the keys are
/// configured, never the keys. No key at all means that only loopback callers are served.
/// </summary>
public sealed class CredentialsOptions
{
    /// <summary>The configuration section the credentials are bound from.</summary>
    public const string Section = "Partwise:Credentials";

    /// <summary>
    /// The accepted keys (<c>Partwise:Credentials:Keys:0:Name</c>, <c>...:0:Sha256</c>, <c>...:0:Roles:0</c>; in the
    /// environment <c>Partwise__Credentials__Keys__0__Name</c> and so on).
    /// </summary>
    public IList<CredentialKey> Keys { get; set; } = [];
}

/// <summary>One accepted key: who holds it, its hash and its roles.</summary>
public sealed class CredentialKey
{
    /// <summary>The holder's name: the caller's <c>User.Identity.Name</c>, used in logs and for rate limits. Unique.</summary>
    public string Name { get; set; } = "";

    /// <summary>The lowercase hexadecimal SHA-256 of the key's UTF-8 bytes (64 digits); <c>hash-key</c> prints it.</summary>
    public string Sha256 { get; set; } = "";

    /// <summary>
    /// Any of <c>reader</c>, <c>submitter</c>, <c>reviewer</c>, <c>admin</c> (admin implies all). A key with no role
    /// still calls the stateless compute endpoints.
    /// </summary>
    public IList<string> Roles { get; set; } = [];
}
