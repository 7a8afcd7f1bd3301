namespace Partwise.Api.Credentials;

/// <summary>
/// Says at start how callers are authenticated: by how many named keys, or, with none configured, that only
/// loopback callers are served. Names only; never a key or its hash.
/// </summary>
public sealed partial class CredentialsStartupLog(KeyRing keys, ILogger<CredentialsStartupLog> logger) : IHostedService
{
    /// <inheritdoc />
    public Task StartAsync(CancellationToken cancellationToken)
    {
        if (keys.IsEmpty)
        {
            LogLoopbackOnly(logger);
        }
        else
        {
            LogKeys(logger, keys.Names.Count, string.Join(", ", keys.Names));
        }

        return Task.CompletedTask;
    }

    /// <inheritdoc />
    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    [LoggerMessage(Level = LogLevel.Warning, Message = "No credentials configured (Partwise:Credentials:Keys): serving loopback callers only, each as holding every role; any other caller gets 401. Run `hash-key` to make a key")]
    private static partial void LogLoopbackOnly(ILogger logger);

    [LoggerMessage(Level = LogLevel.Information, Message = "Credentials: keys configured: {KeyCount} ({KeyNames}); every route but /healthz, /readyz, /metrics and the API document needs one")]
    private static partial void LogKeys(ILogger logger, int keyCount, string keyNames);
}
