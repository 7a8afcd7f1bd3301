using System.Net;
using System.Net.Sockets;
using Partwise.Api.Health;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Health;

/// <summary>The <c>health-probe</c> command-line mode that the container's HEALTHCHECK runs.</summary>
public class HealthProbeTests(PartwiseFactory factory) : IClassFixture<PartwiseFactory>
{
    private static readonly TimeSpan Short = TimeSpan.FromMilliseconds(500);

    [Fact]
    public async Task AHealthyServiceGivesExitCodeZero()
    {
        using var handler = factory.Server.CreateHandler();
        using var error = new StringWriter();
        var code = await HealthProbe.RunAsync([HealthProbe.Command, "http://localhost/healthz"], error, handler, HealthProbe.DefaultTimeout);
        Assert.Equal(HealthProbe.Healthy, code);
        Assert.Equal("", error.ToString());
    }

    [Fact]
    public async Task AnAnswerOtherThan200IsUnhealthyAndSaysWhichStatus()
    {
        using var handler = factory.Server.CreateHandler();
        using var error = new StringWriter();
        var code = await HealthProbe.RunAsync([HealthProbe.Command, "http://localhost/v1/nowhere"], error, handler, HealthProbe.DefaultTimeout);
        Assert.Equal(HealthProbe.Unhealthy, code);
        Assert.Contains("answered 404", error.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task ARefusedConnectionIsUnhealthy()
    {
        // A port that was free a moment ago and has nothing listening now: the real socket path, no test server.
        var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        using var error = new StringWriter();
        var code = await HealthProbe.RunAsync([HealthProbe.Command, $"http://127.0.0.1:{port}/healthz"], error);
        Assert.Equal(HealthProbe.Unhealthy, code);
        Assert.Contains($"127.0.0.1:{port}", error.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task NoAnswerWithinTheTimeoutIsUnhealthy()
    {
        using var handler = new NeverAnswers();
        using var error = new StringWriter();
        var code = await HealthProbe.RunAsync([HealthProbe.Command, "http://localhost/healthz"], error, handler, Short);
        Assert.Equal(HealthProbe.Unhealthy, code);
        Assert.Contains("no answer within 0.5 s", error.ToString(), StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("health-probe")]
    [InlineData("health-probe /healthz")]
    [InlineData("health-probe ftp://127.0.0.1/healthz")]
    [InlineData("health-probe http://127.0.0.1:8080/healthz extra")]
    public async Task AMissingOrUnusableUrlIsAUsageErrorNotAProbe(string commandLine)
    {
        using var error = new StringWriter();
        using var handler = new NeverAnswers();
        var code = await HealthProbe.RunAsync(commandLine.Split(' '), error, handler, Short);
        Assert.Equal(HealthProbe.Usage, code);
        Assert.StartsWith("usage: health-probe", error.ToString(), StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("health-probe http://127.0.0.1:8080/healthz", true)]
    [InlineData("--urls http://127.0.0.1:5080", false)]
    [InlineData("", false)]
    [InlineData("Health-Probe", false)]
    [InlineData("--urls health-probe", false)]
    public void OnlyAFirstArgumentHealthProbeSelectsTheMode(string commandLine, bool selected) =>
        Assert.Equal(selected, HealthProbe.IsRequested(commandLine.Split(' ', StringSplitOptions.RemoveEmptyEntries)));

    private sealed class NeverAnswers : HttpMessageHandler
    {
        protected override async Task<HttpResponseMessage> SendAsync(HttpRequestMessage request, CancellationToken cancellationToken)
        {
            await Task.Delay(Timeout.Infinite, cancellationToken);
            throw new InvalidOperationException("unreachable");
        }
    }
}
