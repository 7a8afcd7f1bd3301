using System.Collections.Concurrent;
using System.Net;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.AspNetCore.TestHost;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Serilog.Core;
using Serilog.Events;

namespace Partwise.Api.Tests.Support;

/// <summary>
/// The one host for HTTP tests: the real Program with optional configuration overrides (for small limits), a
/// fresh SQLite data directory of its own (deleted with the host) so that no test sees another's data, the demo
/// baseline off unless a test turns it on, and a sink that keeps every log event, so tests can read the
/// completion events. The in-process server has no socket, so requests would have no remote address; the host
/// gives them <see cref="RemoteAddress"/>, loopback unless a test says otherwise, so that without configured keys
/// the tests are the caller on the same machine that the service serves (see Credentials/).
/// </summary>
public class PartwiseFactory : WebApplicationFactory<Program>
{
    private readonly Dictionary<string, string?> _settings;

    /// <summary>The default host: the limits as configured in code.</summary>
    public PartwiseFactory()
        : this(new Dictionary<string, string?>())
    {
    }

    /// <summary>A host with the given configuration overrides (for subclasses with their own server or services).</summary>
    protected PartwiseFactory(IReadOnlyDictionary<string, string?> settings)
    {
        DataDirectory = Path.Combine(Path.GetTempPath(), "partwise-api-tests", Guid.NewGuid().ToString("N"));
        _settings = new Dictionary<string, string?>
        {
            ["Partwise:Storage:DataDirectory"] = DataDirectory,
            ["Partwise:Demo:Enabled"] = "false",
        };
        foreach (var (key, value) in settings)
        {
            _settings[key] = value;
        }
    }

    /// <summary>The started host, for tests that stop it themselves.</summary>
    public IHost? StartedHost { get; private set; }

    /// <summary>This host's SQLite data directory.</summary>
    public string DataDirectory { get; }

    /// <summary>A new host with any configuration overridden, for example <c>("Partwise:Demo:Enabled", "true")</c>.</summary>
    public static PartwiseFactory WithSettings(params (string Key, string? Value)[] settings) =>
        new(settings.ToDictionary(s => s.Key, s => s.Value));

    /// <summary>
    /// The remote address every request arrives from (default loopback; null: none, as the bare test server gives);
    /// set it before the first client is made, for example to a documentation address (RFC 5737) for a caller from
    /// the network.
    /// </summary>
    public IPAddress? RemoteAddress { get; set; } = IPAddress.Loopback;

    /// <summary>Every log event the host wrote.</summary>
    public CollectingSink Logs { get; } = new();

    /// <summary>A new host with <c>Partwise:Limits</c> overridden, for example <c>("MaxRows", "3")</c>.</summary>
    public static PartwiseFactory WithLimits(params (string Name, string Value)[] limits) =>
        new(limits.ToDictionary(l => $"Partwise:Limits:{l.Name}", l => (string?)l.Value));

    /// <inheritdoc />
    protected override void ConfigureWebHost(IWebHostBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        builder.ConfigureAppConfiguration(c => c.AddInMemoryCollection(_settings));
        builder.ConfigureTestServices(services =>
        {
            services.AddSingleton<ILogEventSink>(Logs);
            services.AddSingleton<IStartupFilter>(new RemoteAddressStartupFilter(() => RemoteAddress));
        });
    }

    /// <inheritdoc />
    protected override IHost CreateHost(IHostBuilder builder)
    {
        var host = base.CreateHost(builder);
        StartedHost = host;
        return host;
    }

    /// <inheritdoc />
    public override async ValueTask DisposeAsync()
    {
        await base.DisposeAsync();
        GC.SuppressFinalize(this);
        try
        {
            Directory.Delete(DataDirectory, recursive: true);
        }
        catch (IOException)
        {
            // A file still open elsewhere; the temporary directory is cleaned by the system later.
        }
        catch (UnauthorizedAccessException)
        {
        }
    }
}

/// <summary>A Serilog sink that keeps events in memory.</summary>
public sealed class CollectingSink : ILogEventSink
{
    private readonly ConcurrentQueue<LogEvent> _events = new();

    /// <summary>The events so far.</summary>
    public IReadOnlyList<LogEvent> Events => [.. _events];

    /// <inheritdoc />
    public void Emit(LogEvent logEvent) => _events.Enqueue(logEvent);
}
