using System.Reflection;
using Microsoft.Extensions.Options;
using Partwise.Storage;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// The durable store in the host: <see cref="StorageOptions"/> bound from <c>Partwise:Storage</c>
/// (<c>Partwise__Storage__DataDirectory</c>, <c>Partwise__Storage__PostgresConnectionString</c>), one
/// <see cref="PartwiseStorage"/> for the process, and <see cref="StoreAccess"/> that migrates it before first use.
/// </summary>
public static class StorageSetup
{
    /// <summary>The configuration section of the store's options.</summary>
    public const string Section = "Partwise:" + StorageOptions.SectionName;

    /// <summary>
    /// True while the build-time OpenAPI generator runs Program.cs (entry assembly <c>GetDocument.Insider</c>): then
    /// nothing may touch a database.
    /// </summary>
    public static bool IsDocumentGeneration =>
        string.Equals(Assembly.GetEntryAssembly()?.GetName().Name, "GetDocument.Insider", StringComparison.Ordinal);

    /// <summary>Registers the options (validated at start), the store, its access gate and the start-up migration.</summary>
    public static IServiceCollection AddPartwiseStorage(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<StorageOptions>().Bind(configuration.GetSection(Section)).ValidateOnStart();
        services.AddSingleton<IValidateOptions<StorageOptions>, StorageOptionsValidator>();
        // Constructing the store opens nothing, so building the host (also for the OpenAPI generator) needs no database.
        services.AddSingleton(sp => new PartwiseStorage(sp.GetRequiredService<IOptions<StorageOptions>>().Value, sp.GetService<TimeProvider>()));
        services.AddSingleton<StoreAccess>();
        if (!IsDocumentGeneration)
        {
            services.AddHostedService<StorageStartup>();
        }

        return services;
    }
}

/// <summary>Refuses store options that cannot work, so a bad configuration stops the service before it listens.</summary>
public sealed class StorageOptionsValidator : IValidateOptions<StorageOptions>
{
    /// <inheritdoc />
    public ValidateOptionsResult Validate(string? name, StorageOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var problems = options.Validate();
        return problems.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(problems.Select(p => "Partwise:" + p));
    }
}

/// <summary>
/// Hands out the store once its schema is migrated. The migration runs at start; when the database cannot be
/// reached then, the service starts anyway (readiness says so) and every request that needs the store tries the
/// migration again, so the service recovers as soon as the database returns. No connection is cached: the store
/// opens a pooled connection per unit of work. While the database is down, one attempt is made per
/// <see cref="RetryInterval"/>; requests in between fail at once instead of queueing behind connection timeouts.
/// </summary>
public sealed partial class StoreAccess(PartwiseStorage storage, ILogger<StoreAccess> logger, TimeProvider? clock = null)
{
    /// <summary>The least time between two migration attempts while the database cannot be reached.</summary>
    public static readonly TimeSpan RetryInterval = TimeSpan.FromSeconds(1);

    private readonly SemaphoreSlim gate = new(1, 1);
    private readonly TimeProvider time = clock ?? TimeProvider.System;
    private volatile bool migrated;
    private (DateTimeOffset At, string Reason)? lastFailure;

    /// <summary>The store, migrated.</summary>
    /// <exception cref="StorageUnavailableException">The database cannot be reached (the host answers 503).</exception>
    public async ValueTask<PartwiseStorage> ReadyAsync(CancellationToken cancellationToken)
    {
        if (migrated)
        {
            return storage;
        }

        await gate.WaitAsync(cancellationToken).ConfigureAwait(false);
        try
        {
            if (!migrated)
            {
                if (lastFailure is { } failure && time.GetUtcNow() - failure.At < RetryInterval)
                {
                    throw new StorageUnavailableException(failure.Reason);
                }

                try
                {
                    var version = await storage.MigrateAsync(cancellationToken).ConfigureAwait(false);
                    migrated = true;
                    lastFailure = null;
                    LogMigrated(logger, storage.Provider, version);
                }
                catch (StorageUnavailableException e)
                {
                    lastFailure = (time.GetUtcNow(), e.Message);
                    throw;
                }
            }
        }
        finally
        {
            gate.Release();
        }

        return storage;
    }

    [LoggerMessage(Level = LogLevel.Information, Message = "Storage ready: {Provider}, schema version {Version}")]
    private static partial void LogMigrated(ILogger logger, string provider, int version);
}

/// <summary>Migrates the store before the server listens; an unreachable database is logged, not fatal.</summary>
public sealed partial class StorageStartup(StoreAccess access, ILogger<StorageStartup> logger) : IHostedService
{
    /// <inheritdoc />
    public async Task StartAsync(CancellationToken cancellationToken)
    {
        try
        {
            await access.ReadyAsync(cancellationToken).ConfigureAwait(false);
        }
        catch (StorageUnavailableException e)
        {
            LogUnavailable(logger, e.Message);
        }
    }

    /// <inheritdoc />
    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    [LoggerMessage(Level = LogLevel.Warning, Message = "Storage unavailable at start; requests that need it answer 503 until it returns: {Reason}")]
    private static partial void LogUnavailable(ILogger logger, string reason);
}
