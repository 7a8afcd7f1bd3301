using System.Net;
using System.Security.Cryptography;
using System.Text;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Credentials;

/// <summary>Keys for the credential tests and hosts that accept them.</summary>
public static class CredentialHosts
{
    /// <summary>A caller from the network: 203.0.113.0/24 is TEST-NET-3, reserved for documentation (RFC 5737).</summary>
    public static readonly IPAddress Remote = IPAddress.Parse("203.0.113.7");

    /// <summary>One key per role, and one with no role (it may call the stateless compute endpoints only).</summary>
    public static readonly IReadOnlyDictionary<string, (string Key, string[] Roles)> Keys = new Dictionary<string, (string, string[])>
    {
        ["reader-1"] = ("k-reader-Lq2v9Xw4Tz7Bn3Rc8Hd5Mf", ["reader"]),
        ["submitter-1"] = ("k-submitter-Pa6Ye1Ug0Ko4Ji7Sw2Vb", ["submitter"]),
        ["reviewer-1"] = ("k-reviewer-Cx3Nm8Qr5Lt1Wz9Ey6Fa", ["reviewer"]),
        ["admin-1"] = ("k-admin-Hb7Dk2Gs4Vp0Ru5Xn1Oq3Ij", ["admin"]),
        ["compute-1"] = ("k-compute-Ts9Me4Aw6Zc2Yl8Bf0Pk5", []),
    };

    /// <summary>A key no host accepts.</summary>
    public const string WrongKey = "k-wrong-Gn5Rb8Wu2Xe6Lo9Zs3Dm1Vt";

    /// <summary>
    /// SHA-256 in lowercase hex straight from the platform, independently of the service's own helper (whose
    /// agreement with the published test vectors is checked in KeyHashTests).
    /// </summary>
    public static string Sha256Hex(string key) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(key)));

    /// <summary>The configuration entries of <see cref="Keys"/>.</summary>
    public static (string Key, string? Value)[] Settings()
    {
        var settings = new List<(string, string?)>();
        var i = 0;
        foreach (var (name, (key, roles)) in Keys)
        {
            settings.Add(($"Partwise:Credentials:Keys:{i}:Name", name));
            settings.Add(($"Partwise:Credentials:Keys:{i}:Sha256", Sha256Hex(key)));
            for (var r = 0; r < roles.Length; r++)
            {
                settings.Add(($"Partwise:Credentials:Keys:{i}:Roles:{r}", roles[r]));
            }

            i++;
        }

        return [.. settings];
    }

    /// <summary>A host with <see cref="Keys"/> configured, reached from the network.</summary>
    public static PartwiseFactory WithKeys()
    {
        var factory = PartwiseFactory.WithSettings(Settings());
        factory.RemoteAddress = Remote;
        return factory;
    }

    /// <summary>A client that sends <paramref name="key"/> as its Bearer credential (null: no header).</summary>
    public static HttpClient Client(PartwiseFactory factory, string? key)
    {
        ArgumentNullException.ThrowIfNull(factory);
        var client = factory.CreateClient();
        if (key is not null)
        {
            client.DefaultRequestHeaders.Authorization = new System.Net.Http.Headers.AuthenticationHeaderValue("Bearer", key);
        }

        return client;
    }
}

/// <summary>One host with keys shared by a test class (its store is not written to by any test that asserts on data).</summary>
public sealed class KeyedHost : IAsyncLifetime
{
    public PartwiseFactory Factory { get; } = CredentialHosts.WithKeys();

    public Task InitializeAsync() => Task.CompletedTask;

    public async Task DisposeAsync() => await Factory.DisposeAsync();
}
