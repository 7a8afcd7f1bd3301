using System.Reflection;
using System.Text.RegularExpressions;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.Options;
using Partwise.Api.Health;
using Partwise.Storage;

namespace Partwise.Deployment.Tests.Support;

/// <summary>
/// The app's real settings: its option classes (public classes named <c>*Options</c> in Partwise.Api and
/// Partwise.Storage with a <c>Section</c> constant, or a <c>SectionName</c> under <c>Partwise:</c>), bound with the
/// configuration binder as the host binds them, unknown keys refused, then checked by the app's own validators.
/// </summary>
internal static partial class AppSettings
{
    private static readonly Assembly[] AppAssemblies = [typeof(HealthProbe).Assembly, typeof(StorageOptions).Assembly];

    /// <summary>The option classes by their configuration section (<c>Partwise:Limits</c> and so on).</summary>
    public static IReadOnlyDictionary<string, Type> Sections() =>
        AppAssemblies.SelectMany(a => a.GetExportedTypes())
            .Where(t => t.IsClass && !t.IsAbstract && t.Name.EndsWith("Options", StringComparison.Ordinal))
            .Select(t => (Type: t, Section: SectionOf(t)))
            .Where(s => s.Section is not null)
            .ToDictionary(s => s.Section!, s => s.Type, StringComparer.OrdinalIgnoreCase);

    /// <summary>The option classes that name no section, so a key for them could not be checked (should be none).</summary>
    public static IEnumerable<Type> OptionClassesWithoutSection() =>
        AppAssemblies.SelectMany(a => a.GetExportedTypes())
            .Where(t => t.IsClass && !t.IsAbstract && t.Name.EndsWith("Options", StringComparison.Ordinal) && t.GetProperties().Any(p => p.CanWrite))
            .Where(t => SectionOf(t) is null);

    /// <summary>
    /// What is wrong with environment-variable settings (<c>Partwise__Limits__MaxRows</c> = "1000"): a key that names
    /// no setting of the app, a value the binder cannot convert, or a value the app's validator refuses. Empty when
    /// the app would start with them.
    /// </summary>
    public static IReadOnlyList<string> Problems(IReadOnlyDictionary<string, string> environment)
    {
        var problems = new List<string>();
        var sections = Sections();
        var bySection = new Dictionary<string, Dictionary<string, string?>>(StringComparer.OrdinalIgnoreCase);
        foreach (var (variable, value) in environment)
        {
            // The host's environment-variable provider reads '__' as the ':' of a configuration path.
            var key = variable.Replace("__", ":", StringComparison.Ordinal);
            var section = sections.Keys.Where(s => key.StartsWith(s + ":", StringComparison.OrdinalIgnoreCase)).MaxBy(s => s.Length);
            if (section is null)
            {
                if (key.StartsWith(CredentialsSection + ":", StringComparison.OrdinalIgnoreCase))
                {
                    problems.AddRange(CredentialsProblems(key, value));
                    continue;
                }

                problems.Add($"{variable}: no option class of the app binds the section of {key}");
                continue;
            }

            if (!bySection.TryGetValue(section, out var settings))
            {
                bySection[section] = settings = new Dictionary<string, string?>(StringComparer.OrdinalIgnoreCase);
            }

            settings[key] = value;
        }

        foreach (var (section, settings) in bySection)
        {
            var type = sections[section];
            var configuration = new ConfigurationBuilder().AddInMemoryCollection(settings).Build();
            object? bound;
            try
            {
                bound = configuration.GetSection(section).Get(type, o => o.ErrorOnUnknownConfiguration = true);
            }
            catch (InvalidOperationException e)
            {
                problems.Add($"{section}: {e.Message}");
                continue;
            }

            Assert.NotNull(bound);
            problems.AddRange(Validate(type, bound));
        }

        return problems;
    }

    /// <summary>The value a setting takes when bound from these variables, through its option class.</summary>
    public static object? Bound(IReadOnlyDictionary<string, string> environment, Type optionsType, string property)
    {
        var configuration = new ConfigurationBuilder()
            .AddInMemoryCollection(environment.Select(e => KeyValuePair.Create(e.Key.Replace("__", ":", StringComparison.Ordinal), (string?)e.Value)))
            .Build();
        var section = Sections().Single(s => s.Value == optionsType).Key;
        var bound = configuration.GetSection(section).Get(optionsType) ?? Activator.CreateInstance(optionsType);
        return optionsType.GetProperty(property)!.GetValue(bound);
    }

    private static string? SectionOf(Type type)
    {
        static string? Constant(Type t, string name) =>
            t.GetField(name, BindingFlags.Public | BindingFlags.Static) is { IsLiteral: true } f ? f.GetRawConstantValue() as string : null;

        return Constant(type, "Section") ?? (Constant(type, "SectionName") is { } relative ? "Partwise:" + relative : null);
    }

    private static IEnumerable<string> Validate(Type type, object options)
    {
        var validatorInterface = typeof(IValidateOptions<>).MakeGenericType(type);
        var validators = AppAssemblies.SelectMany(a => a.GetExportedTypes())
            .Where(t => t.IsClass && !t.IsAbstract && validatorInterface.IsAssignableFrom(t) && t.GetConstructor(Type.EmptyTypes) is not null);
        foreach (var validatorType in validators)
        {
            var validator = Activator.CreateInstance(validatorType)!;
            var result = (ValidateOptionsResult)validatorInterface.GetMethod(nameof(IValidateOptions<object>.Validate))!
                .Invoke(validator, [Options.DefaultName, options])!;
            if (result.Failed)
            {
                yield return $"{validatorType.Name}: {result.FailureMessage}";
            }
        }
    }

    // API keys (`Partwise:Credentials`). While no option class of this build binds that section, the keys are checked
    // against the names of the credentials settings (Keys:N:Name, Keys:N:Sha256, Keys:N:Roles:M), SHA-256 as 64 hex
    // digits, and the roles of the HTTP contract (API.md, "Operations": reader, submitter, reviewer, admin). Once an
    // option class claims the section, the binder and its validator above check them instead.
    private const string CredentialsSection = "Partwise:Credentials";

    private static readonly HashSet<string> ContractRoles = new(["reader", "submitter", "reviewer", "admin"], StringComparer.Ordinal);

    private static IEnumerable<string> CredentialsProblems(string key, string value)
    {
        var match = CredentialsKey().Match(key);
        if (!match.Success)
        {
            yield return $"{key}: not a credentials setting (Keys:N:Name, Keys:N:Sha256, Keys:N:Roles:M)";
            yield break;
        }

        var field = match.Groups["field"].Value;
        if (field == "Sha256" && !Sha256Hex().IsMatch(value))
        {
            yield return $"{key}: a key is stored as its SHA-256 in 64 lowercase hex digits, not '{value}'";
        }

        if (field.StartsWith("Roles", StringComparison.Ordinal) && !ContractRoles.Contains(value))
        {
            yield return $"{key}: '{value}' is not a role of the contract ({string.Join(", ", ContractRoles)})";
        }

        if (field == "Name" && string.IsNullOrWhiteSpace(value))
        {
            yield return $"{key}: a key needs a name";
        }
    }

    [GeneratedRegex(@"^Partwise:Credentials:Keys:[0-9]+:(?<field>Name|Sha256|Roles:[0-9]+)$", RegexOptions.CultureInvariant)]
    private static partial Regex CredentialsKey();

    [GeneratedRegex("^[0-9a-f]{64}$", RegexOptions.CultureInvariant)]
    private static partial Regex Sha256Hex();
}
