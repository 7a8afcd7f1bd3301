using System.Globalization;
using Microsoft.Extensions.Options;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Size and computation limits, bound from the configuration section <c>Partwise:Limits</c>; the defaults here
/// apply when the section is absent. Checked once at start, so a bad value stops the service before it listens.
/// </summary>
public sealed class LimitsOptions
{
    /// <summary>The configuration section the limits are bound from.</summary>
    public const string Section = "Partwise:Limits";

    /// <summary>Largest request body in bytes (default 32 MiB); a larger body is a 413.</summary>
    public long MaxBodyBytes { get; set; } = 32L * 1024 * 1024;

    /// <summary>Most parts (columns) a table may have (default 1,000); more is a 413 <c>/problems/too-large</c>.</summary>
    public int MaxParts { get; set; } = 1_000;

    /// <summary>Most rows a table may have (default 1,000,000); more is a 413 <c>/problems/too-large</c>.</summary>
    public int MaxRows { get; set; } = 1_000_000;

    /// <summary>Most rows for the distance matrix (default 5,000: an n × n result); more is a 422 <c>/problems/computation-limit</c>.</summary>
    public int MaxDistanceRows { get; set; } = 5_000;

    /// <summary>
    /// Most numbers one result may hold (default 20,000,000, about 160 MB of doubles); a transform whose output
    /// would be larger (all pairwise ratios of many parts) is a 422 <c>/problems/computation-limit</c>.
    /// </summary>
    public long MaxResultValues { get; set; } = 20_000_000;

    /// <summary>Most samples one screening request may hold (default 1,000); more is a 413 <c>/problems/too-large</c>.</summary>
    public int MaxScreeningSamples { get; set; } = 1_000;

    /// <summary>
    /// The longest a compute request may run, in seconds (default 30; fractions allowed; 0: no limit). Past it the
    /// computation is stopped and the answer is a 503 <c>/problems/timeout</c>.
    /// </summary>
    public double ComputeTimeoutSeconds { get; set; } = 30;
}

/// <summary>Rejects limits that would make the service refuse everything or accept unbounded work.</summary>
public sealed class LimitsOptionsValidator : IValidateOptions<LimitsOptions>
{
    /// <inheritdoc />
    public ValidateOptionsResult Validate(string? name, LimitsOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var failures = new List<string>();
        if (options.MaxBodyBytes < 1024)
        {
            failures.Add($"{LimitsOptions.Section}:MaxBodyBytes must be at least 1024.");
        }

        if (options.MaxParts < 2)
        {
            failures.Add($"{LimitsOptions.Section}:MaxParts must be at least 2 (a composition has two or more parts).");
        }

        if (options.MaxRows < 1)
        {
            failures.Add($"{LimitsOptions.Section}:MaxRows must be at least 1.");
        }

        if (options.MaxDistanceRows is < 1 or > 46_340)
        {
            // 46,340² is the largest square below 2³¹, the length limit of one .NET array.
            failures.Add($"{LimitsOptions.Section}:MaxDistanceRows must be between 1 and 46,340.");
        }

        if (options.MaxResultValues is < 1 or > int.MaxValue)
        {
            failures.Add($"{LimitsOptions.Section}:MaxResultValues must be between 1 and {int.MaxValue}.");
        }

        if (options.MaxScreeningSamples < 1)
        {
            failures.Add($"{LimitsOptions.Section}:MaxScreeningSamples must be at least 1.");
        }

        if (!double.IsFinite(options.ComputeTimeoutSeconds) || options.ComputeTimeoutSeconds is < 0 or > 86_400)
        {
            failures.Add(string.Create(CultureInfo.InvariantCulture, $"{LimitsOptions.Section}:ComputeTimeoutSeconds must be between 0 (no limit) and 86,400 (a day); it is {options.ComputeTimeoutSeconds}."));
        }

        return failures.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(failures);
    }
}
