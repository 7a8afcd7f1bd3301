using System.Text;
using Microsoft.Extensions.Options;
using Partwise.Api.Infrastructure;
using Partwise.Demo;
using Partwise.Storage;

namespace Partwise.Api.Baselines;

/// <summary>
/// Whether the service loads the demo baseline at start (<c>Partwise:Demo:Enabled</c>). Absent, it is on in the
/// Development environment (what <c>dotnet run</c> uses) and off elsewhere.
/// </summary>
public sealed class DemoOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Partwise:Demo";

    /// <summary>True to load the demo baseline, false not to, null for the environment's default.</summary>
    public bool? Enabled { get; set; }
}

/// <summary>
/// Loads the baseline of the invented well-11's 2025 samples (<c>demo/well-11-baseline.json</c>, made by the seeded
/// groundwater generator) when no baseline of that name is stored yet, and logs its id, so that a new user can post
/// a drifting well-11 sample and see it flagged with its reasons. Runs after the store's migration.
/// </summary>
public sealed partial class DemoBaseline(IOptions<DemoOptions> options, IHostEnvironment environment, StoreAccess store, ILogger<DemoBaseline> logger) : IHostedService
{
    /// <summary>The demo file the baseline request comes from.</summary>
    public const string FileName = "well-11-baseline.json";

    /// <summary>The request body of the demo baseline, as committed in <c>demo/</c>.</summary>
    public static string RequestBody() =>
        DemoFiles.Build(GroundwaterScenario.Create(GroundwaterScenario.DemoSeed)).Single(f => f.Name == FileName).Content;

    /// <inheritdoc />
    public async Task StartAsync(CancellationToken cancellationToken)
    {
        if (!(options.Value.Enabled ?? environment.IsDevelopment()))
        {
            return;
        }

        try
        {
            var request = RequestJson.Deserialize<BaselineRequest>(Encoding.UTF8.GetBytes(RequestBody()));
            var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
            var existing = (await storage.Baselines.ListAsync(activeOnly: true, cancellationToken).ConfigureAwait(false))
                .FirstOrDefault(b => string.Equals(b.Name, request.Name, StringComparison.Ordinal));
            if (existing is not null)
            {
                LogDemo(logger, existing.Id, existing.Name, "already stored");
                return;
            }

            var pending = BaselineFitting.Fit(request);
            var record = await storage.Baselines.CreateAsync(
                pending.Name,
                stamp => BaselineJson.Write(pending.Stamp(stamp.Id, stamp.Version, stamp.CreatedAt)),
                cancellationToken).ConfigureAwait(false);
            LogDemo(logger, record.Id, record.Name, "loaded");
        }
        catch (StorageUnavailableException e)
        {
            LogNoDemo(logger, e.Message);
        }
    }

    /// <inheritdoc />
    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    [LoggerMessage(Level = LogLevel.Information, Message = "Demo baseline {BaselineId} {Name} (invented data) {State}: post demo/well-11-screenings.json to /v1/baselines/<that id>/screenings")]
    private static partial void LogDemo(ILogger logger, string baselineId, string name, string state);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Demo baseline not loaded, storage unavailable: {Reason}")]
    private static partial void LogNoDemo(ILogger logger, string reason);
}

/// <summary>Registrations of the baseline, screening and flag features.</summary>
public static class BaselineSetup
{
    /// <summary>The cache of rebuilt baselines and, except while the OpenAPI document is generated, the demo loader.</summary>
    public static IServiceCollection AddPartwiseBaselines(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<DemoOptions>().Bind(configuration.GetSection(DemoOptions.Section)).ValidateOnStart();
        services.AddSingleton<BaselineCache>();
        if (!StorageSetup.IsDocumentGeneration)
        {
            services.AddHostedService<DemoBaseline>();
        }

        return services;
    }
}
