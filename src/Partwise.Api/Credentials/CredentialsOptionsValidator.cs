using Microsoft.Extensions.Options;

namespace Partwise.Api.Credentials;

/// <summary>
/// Checks the configured keys once at start, so that a mistyped hash or role stops the service with a message
/// naming the entry instead of silently refusing its holder.
/// </summary>
public sealed class CredentialsOptionsValidator : IValidateOptions<CredentialsOptions>
{
    /// <inheritdoc />
    public ValidateOptionsResult Validate(string? name, CredentialsOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var failures = new List<string>();
        var names = new Dictionary<string, int>(StringComparer.Ordinal);
        var hashes = new Dictionary<string, int>(StringComparer.OrdinalIgnoreCase);
        for (var i = 0; i < options.Keys.Count; i++)
        {
            var key = options.Keys[i];
            var at = $"{CredentialsOptions.Section}:Keys:{i}";
            if (string.IsNullOrWhiteSpace(key.Name))
            {
                failures.Add($"{at}:Name is empty; every key needs a name (it appears in logs instead of the key).");
            }
            else if (!names.TryAdd(key.Name, i))
            {
                failures.Add($"{at}:Name '{key.Name}' is also the name of {CredentialsOptions.Section}:Keys:{names[key.Name]}; names must be unique.");
            }

            if (!KeyHash.IsHexDigest(key.Sha256))
            {
                failures.Add($"{at}:Sha256 must be 64 hexadecimal digits (the SHA-256 of the key, as `hash-key` prints it); it has {key.Sha256?.Length ?? 0} characters{(key.Sha256 is { Length: 64 } ? " that are not all hexadecimal" : "")}.");
            }
            else if (!hashes.TryAdd(key.Sha256, i))
            {
                failures.Add($"{at}:Sha256 is the same as that of {CredentialsOptions.Section}:Keys:{hashes[key.Sha256]}; each holder needs a key of its own.");
            }

            for (var r = 0; r < key.Roles.Count; r++)
            {
                if (!Roles.IsKnown(key.Roles[r]))
                {
                    failures.Add($"{at}:Roles:{r} '{key.Roles[r]}' is not a role; the roles are {string.Join(", ", Roles.All)}.");
                }
            }
        }

        return failures.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(failures);
    }
}
