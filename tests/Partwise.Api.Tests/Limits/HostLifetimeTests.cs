using System.Globalization;
using System.Text;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Options;
using Partwise.Api.Infrastructure;
using Partwise.Api.Tests.Support;
using Partwise.Storage;
using Serilog.Events;

namespace Partwise.Api.Tests.Limits;

/// <summary>
/// The real server (Kestrel on a free loopback port) around the requests: a caller that disconnects stops its
/// computation, and a stop lets a screening in flight finish and commit before the host ends.
/// </summary>
public class HostLifetimeTests
{
    [Fact]
    public async Task AScreeningInFlightWhenTheHostStopsFinishesAndIsStored()
    {
        using var factory = new ServerFactory(("Partwise:Shutdown:TimeoutSeconds", "20"));
        using var client = factory.CreateClient();
        var id = (await BaselineBodies.Create(client, BaselineBodies.Request("shutdown"))).GetProperty("id").GetString()!;

        // Another connection holds SQLite's write lock, so the screening's commit waits (within the store's 10 s
        // busy timeout) until the test lets it go: the request is certainly in flight when the stop begins.
        var file = Path.Combine(factory.DataDirectory, StorageOptions.SqliteFileName);
        var holder = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = file, Pooling = false }.ToString());
        await holder.OpenAsync();
        using (var begin = holder.CreateCommand())
        {
            begin.CommandText = "BEGIN IMMEDIATE;";
            await begin.ExecuteNonQueryAsync();
        }

        var screening = client.PostJson($"/v1/baselines/{id}/screenings", "{\"sample\": " + BaselineBodies.Sample("in-flight-1", 40, 30, 30) + "}");
        await factory.ScreeningArrived.Task.WaitAsync(TimeSpan.FromSeconds(30));
        var stopping = factory.StartedHost!.StopAsync();
        await Task.Delay(TimeSpan.FromMilliseconds(500));
        Assert.False(screening.IsCompleted, "the screening answered while its commit was still blocked");
        Assert.False(stopping.IsCompleted, "the host stopped before the screening in flight finished");

        using (var rollback = holder.CreateCommand())
        {
            rollback.CommandText = "ROLLBACK;";
            await rollback.ExecuteNonQueryAsync();
        }

        await holder.DisposeAsync();
        using var response = await screening.WaitAsync(TimeSpan.FromSeconds(30));
        var body = await response.OkJson();
        Assert.Equal("in-flight-1", body.GetProperty("results")[0].GetProperty("sampleId").GetString());
        await stopping.WaitAsync(TimeSpan.FromSeconds(30));

        // The acknowledged screening is in the store, read afresh from the file after the host has stopped.
        await using var storage = new PartwiseStorage(new StorageOptions { DataDirectory = factory.DataDirectory });
        Assert.NotNull(await storage.Screenings.GetAsync(id, "in-flight-1", CancellationToken.None));
    }

    [Fact]
    public async Task ACallerThatDisconnectsStopsTheComputation()
    {
        using var factory = new ServerFactory(("Partwise:Limits:ComputeTimeoutSeconds", "0"));
        using var client = factory.CreateClient();
        using var gone = new CancellationTokenSource(TimeSpan.FromMilliseconds(700));
        using var content = new StringContent(ComputeTimeoutTests.WideTable(30, 1_000), Encoding.UTF8, "application/json");
        await Assert.ThrowsAnyAsync<OperationCanceledException>(() => client.PostAsync(new Uri("/v1/ratio-selection", UriKind.Relative), content, gone.Token));

        // The server writes the completion event once the handler has given up. The selection sets the ratio count
        // after RatioSelection.Run returns, so its absence shows that the run itself stopped. A caller that left is
        // no error.
        LogEvent? completion = null;
        for (var i = 0; i < 300 && completion is null; i++)
        {
            completion = factory.Logs.Events.FirstOrDefault(ComputeTimeoutTests.IsCompletion);
            await Task.Delay(100);
        }

        Assert.NotNull(completion);
        Assert.Equal("1000", completion.Properties["PartCount"].ToString());
        Assert.False(completion.Properties.ContainsKey("RatioCount"));
        Assert.DoesNotContain(factory.Logs.Events, e => e.Exception is not null && e.Level >= LogEventLevel.Error);
    }

    [Fact]
    public void TheShutdownTimeoutReachesTheHost()
    {
        using var factory = PartwiseFactory.WithSettings(("Partwise:Shutdown:TimeoutSeconds", "7.5"));
        using var client = factory.CreateClient();
        Assert.Equal(TimeSpan.FromSeconds(7.5), factory.Services.GetRequiredService<IOptions<HostOptions>>().Value.ShutdownTimeout);
        Assert.Equal(20, new ShutdownOptions().TimeoutSeconds);
    }

    [Theory]
    [InlineData("0")]
    [InlineData("-3")]
    [InlineData("7200")]
    public void AnInvalidShutdownTimeoutStopsTheServiceAtStart(string value)
    {
        using var factory = PartwiseFactory.WithSettings(("Partwise:Shutdown:TimeoutSeconds", value));
        var error = Assert.ThrowsAny<Exception>(() => factory.CreateClient());
        Assert.Contains("Partwise:Shutdown:TimeoutSeconds", Flatten(error), StringComparison.Ordinal);
    }

    private static string Flatten(Exception e) => e.InnerException is null ? e.Message : e.Message + " " + Flatten(e.InnerException);

    /// <summary>The test host on Kestrel at 127.0.0.1, telling when a screening request arrives.</summary>
    private sealed class ServerFactory : PartwiseFactory
    {
        public ServerFactory(params (string Key, string? Value)[] settings)
            : base(settings.ToDictionary(s => s.Key, s => s.Value))
        {
            // Port 0: the system picks a free one, so parallel runs on one machine do not collide.
            UseKestrel(kestrel => kestrel.Listen(System.Net.IPAddress.Loopback, 0));
        }

        public TaskCompletionSource ScreeningArrived { get; } = new(TaskCreationOptions.RunContinuationsAsynchronously);

        protected override void ConfigureWebHost(IWebHostBuilder builder)
        {
            base.ConfigureWebHost(builder);
            builder.ConfigureServices(services => services.AddSingleton<IStartupFilter>(new ArrivalSignal(this)));
        }

        private sealed class ArrivalSignal(ServerFactory factory) : IStartupFilter
        {
            public Action<IApplicationBuilder> Configure(Action<IApplicationBuilder> next) => app =>
            {
                app.Use((context, following) =>
                {
                    if (context.Request.Path.Value?.EndsWith("/screenings", StringComparison.Ordinal) == true)
                    {
                        factory.ScreeningArrived.TrySetResult();
                    }

                    return following(context);
                });
                next(app);
            };
        }
    }
}
