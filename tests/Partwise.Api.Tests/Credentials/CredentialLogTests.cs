using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Credentials;

public class CredentialLogTests
{
    [Fact]
    public async Task TheLogNamesTheKeysButNeverHoldsAKeyOrItsHash()
    {
        await using var factory = CredentialHosts.WithKeys();
        foreach (var key in CredentialHosts.Keys.Values.Select(k => k.Key).Append(CredentialHosts.WrongKey))
        {
            using var client = CredentialHosts.Client(factory, key);
            using var list = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
            using var create = await client.PostJson("/v1/baselines", "{}");
        }

        var start = Assert.Single(factory.Logs.Events, e => e.MessageTemplate.Text.StartsWith("Credentials:", StringComparison.Ordinal));
        var rendered = start.RenderMessage();
        Assert.Contains("keys configured: 5", rendered, StringComparison.Ordinal);
        foreach (var name in CredentialHosts.Keys.Keys)
        {
            Assert.Contains(name, rendered, StringComparison.Ordinal);
        }

        var secrets = CredentialHosts.Keys.Values.Select(k => k.Key).Append(CredentialHosts.WrongKey).ToArray();
        var hashes = secrets.Select(CredentialHosts.Sha256Hex).ToArray();
        foreach (var logEvent in factory.Logs.Events)
        {
            using var writer = new StringWriter();
            logEvent.RenderMessage(writer);
            foreach (var property in logEvent.Properties)
            {
                writer.Write($" {property.Key}={property.Value}");
            }

            var text = writer.ToString();
            foreach (var secret in secrets.Concat(hashes))
            {
                Assert.DoesNotContain(secret, text, StringComparison.OrdinalIgnoreCase);
            }
        }
    }
}
