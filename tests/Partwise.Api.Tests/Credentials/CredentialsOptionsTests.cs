using Microsoft.Extensions.Options;
using Partwise.Api.Credentials;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Credentials;

public class CredentialsOptionsTests
{
    private static readonly string Hash = CredentialHosts.Sha256Hex("some-key-dddddddddddddddddddd");

    private static ValidateOptionsResult Validate(params CredentialKey[] keys)
    {
        var options = new CredentialsOptions();
        foreach (var key in keys)
        {
            options.Keys.Add(key);
        }

        return new CredentialsOptionsValidator().Validate(null, options);
    }

    [Fact]
    public void NoKeysAndWellFormedKeysAreValid()
    {
        Assert.True(Validate().Succeeded);
        Assert.True(Validate(
            new CredentialKey { Name = "a", Sha256 = Hash, Roles = ["reader", "submitter", "reviewer", "admin"] },
            new CredentialKey { Name = "b", Sha256 = CredentialHosts.Sha256Hex("x"), Roles = [] }).Succeeded);
    }

    [Theory]
    [InlineData("abc", "Partwise:Credentials:Keys:0:Sha256 must be 64 hexadecimal digits")]
    [InlineData("zz7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", "that are not all hexadecimal")]
    public void ABadHashIsRefusedNamingTheEntry(string sha256, string message)
    {
        var result = Validate(new CredentialKey { Name = "a", Sha256 = sha256, Roles = ["reader"] });
        Assert.True(result.Failed);
        Assert.Contains(message, result.FailureMessage, StringComparison.Ordinal);
    }

    [Fact]
    public void AnUnknownRoleIsRefusedListingTheRoles()
    {
        var result = Validate(new CredentialKey { Name = "a", Sha256 = Hash, Roles = ["reader", "Writer"] });
        Assert.True(result.Failed);
        Assert.Contains("Partwise:Credentials:Keys:0:Roles:1 'Writer' is not a role; the roles are reader, submitter, reviewer, admin", result.FailureMessage, StringComparison.Ordinal);
    }

    [Fact]
    public void ADuplicateNameOrHashIsRefused()
    {
        var names = Validate(
            new CredentialKey { Name = "a", Sha256 = Hash, Roles = [] },
            new CredentialKey { Name = "a", Sha256 = CredentialHosts.Sha256Hex("y"), Roles = [] });
        Assert.Contains("Keys:1:Name 'a' is also the name of Partwise:Credentials:Keys:0", names.FailureMessage, StringComparison.Ordinal);

        var hashes = Validate(
            new CredentialKey { Name = "a", Sha256 = Hash, Roles = [] },
            new CredentialKey { Name = "b", Sha256 = Hash.ToUpperInvariant(), Roles = [] });
        Assert.Contains("Keys:1:Sha256 is the same as that of Partwise:Credentials:Keys:0", hashes.FailureMessage, StringComparison.Ordinal);
    }

    [Fact]
    public void AnEmptyNameIsRefused()
    {
        var result = Validate(new CredentialKey { Name = " ", Sha256 = Hash, Roles = [] });
        Assert.Contains("Keys:0:Name is empty", result.FailureMessage, StringComparison.Ordinal);
    }

    [Fact]
    public async Task ABadKeyEntryStopsTheServiceAtStartWithItsMessage()
    {
        await using var factory = PartwiseFactory.WithSettings(
            ("Partwise:Credentials:Keys:0:Name", "pipeline-1"),
            ("Partwise:Credentials:Keys:0:Sha256", "not-a-hash"),
            ("Partwise:Credentials:Keys:0:Roles:0", "reader"));
        var exception = Assert.ThrowsAny<Exception>(() => factory.CreateClient());
        Assert.Contains("Partwise:Credentials:Keys:0:Sha256 must be 64 hexadecimal digits", exception.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task AKeyWithTwoRolesIsAcceptedFromConfiguration()
    {
        await using var factory = PartwiseFactory.WithSettings(
            ("Partwise:Credentials:Keys:0:Name", "pipeline-1"),
            ("Partwise:Credentials:Keys:0:Sha256", Hash),
            ("Partwise:Credentials:Keys:0:Roles:0", "submitter"),
            ("Partwise:Credentials:Keys:0:Roles:1", "reader"));
        using var client = CredentialHosts.Client(factory, "some-key-dddddddddddddddddddd");
        using var response = await client.GetAsync(new Uri("/v1/flags", UriKind.Relative));
        await response.OkJson();
    }
}
