using System.Buffers.Text;
using System.Security.Cryptography;

namespace Partwise.Api.Credentials;

/// <summary>
/// <c>hash-key</c>: prints a new random key (32 bytes from the system's cryptographic generator, base64url without
/// padding, RFC 4648 §5) or hashes a given one, with the configuration lines that accept it, and exits. It runs
/// before the host is built, so it starts no server and opens no store.
/// </summary>
public static class HashKeyCommand
{
    /// <summary>The command's name, the first argument.</summary>
    public const string Name = "hash-key";

    /// <summary>Random bytes in a new key: 256 bits, out of reach of guessing.</summary>
    public const int KeyBytes = 32;

    /// <summary>
    /// Runs the command when <paramref name="args"/> starts with <c>hash-key</c>, setting <see cref="Environment.ExitCode"/>;
    /// returns false (and does nothing) otherwise, so the service starts.
    /// </summary>
    public static bool TryRun(string[] args)
    {
        ArgumentNullException.ThrowIfNull(args);
        if (args.Length == 0 || args[0] != Name)
        {
            return false;
        }

        Environment.ExitCode = Run(args[1..], Console.In, Console.Out, Console.Error);
        return true;
    }

    /// <summary>
    /// <c>hash-key</c> (a new key), <c>hash-key KEY</c> (that key) or <c>hash-key -</c> (the key on the first line of
    /// standard input, so it stays out of the shell's history). Returns the exit code: 0, or 2 for a usage error.
    /// </summary>
    public static int Run(IReadOnlyList<string> args, TextReader input, TextWriter output, TextWriter error)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(error);
        // "--" starts an option, of which there are none; a key that begins so (base64url allows it) comes through "-".
        if (args.Count > 1 || args is [{ } a] && a.StartsWith("--", StringComparison.Ordinal))
        {
            error.WriteLine($"usage: {Name} [KEY | -]   (no KEY: make a new random key; -: read the key from standard input)");
            return 2;
        }

        var fresh = args.Count == 0;
        var key = fresh ? NewKey() : args[0] == "-" ? (input.ReadLine() ?? "").Trim() : args[0];
        if (!IsBearerToken(key))
        {
            error.WriteLine("The key must be one or more of the characters A-Z a-z 0-9 - . _ ~ + / (then optional '='), as an HTTP Bearer credential allows (RFC 6750 §2.1).");
            return 2;
        }

        var hash = KeyHash.Hex(key);
        if (fresh)
        {
            output.WriteLine("A new key. Give it to its holder once and keep it out of configuration; only its hash goes there.");
            output.WriteLine();
            output.WriteLine($"key:    {key}");
        }
        else if (key.Length < 22)
        {
            error.WriteLine("Warning: this key is shorter than 22 characters (128 bits of base64); a new one from `hash-key` is safer.");
        }

        output.WriteLine($"sha256: {hash}");
        output.WriteLine();
        output.WriteLine("appsettings.json (choose the name and the roles: reader, submitter, reviewer, admin):");
        output.WriteLine($$"""
              "Partwise": { "Credentials": { "Keys": [
                { "Name": "pipeline-1", "Sha256": "{{hash}}", "Roles": ["submitter"] }
              ] } }
            """);
        output.WriteLine();
        output.WriteLine("or the environment (the next key is __1__, a second role __Roles__1):");
        output.WriteLine("  Partwise__Credentials__Keys__0__Name=pipeline-1");
        output.WriteLine($"  Partwise__Credentials__Keys__0__Sha256={hash}");
        output.WriteLine("  Partwise__Credentials__Keys__0__Roles__0=submitter");
        output.WriteLine();
        output.WriteLine("The holder sends it as: Authorization: Bearer <key>");
        return 0;
    }

    /// <summary>A new key: <see cref="KeyBytes"/> random bytes in base64url without padding (43 characters).</summary>
    public static string NewKey() => Base64Url.EncodeToString(RandomNumberGenerator.GetBytes(KeyBytes));

    /// <summary>Whether <paramref name="key"/> fits the <c>b64token</c> of RFC 6750 §2.1, so it can travel in the header.</summary>
    public static bool IsBearerToken(string key)
    {
        ArgumentNullException.ThrowIfNull(key);
        var body = key.TrimEnd('=');
        return body.Length > 0 && body.All(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '.' or '_' or '~' or '+' or '/');
    }
}
