using System.Collections.Concurrent;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.AspNetCore.TestHost;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Serilog.Core;
using Serilog.Events;

namespace Partwise.Api.Tests.Support;

/// <summary>
/// The one host for HTTP tests: the real Program with optional configuration overrides (for small limits) and a
/// sink that keeps every log event, so tests can read the completion events.
/// </summary>
public class PartwiseFactory : WebApplicationFactory<Program>
{
    private readonly IReadOnlyDictionary<string, string?> _settings;

    /// <summary>The default host: the limits as configured in code.</summary>
    public PartwiseFactory()
        : this(new Dictionary<string, string?>())
    {
    }

    private PartwiseFactory(IReadOnlyDictionary<string, string?> settings) => _settings = settings;

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
        builder.ConfigureTestServices(services => services.AddSingleton<ILogEventSink>(Logs));
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
