using System.Net;

namespace Partwise.Api.Health;

/// <summary>
/// The command-line mode <c>health-probe URL</c> (<c>dotnet Partwise.Api.dll health-probe http://127.0.0.1:8080/healthz</c>):
/// one GET of the service's own health route, exit code 0 on a 200 and 1 otherwise. It exists for the container's
/// HEALTHCHECK, because the runtime image carries no HTTP client. It builds no host and reads no configuration, so it
/// never opens the store; the process ends when the answer (or the timeout) is in.
/// </summary>
public static class HealthProbe
{
    /// <summary>The first argument that selects this mode.</summary>
    public const string Command = "health-probe";

    /// <summary>Exit code for a 200 answer.</summary>
    public const int Healthy = 0;

    /// <summary>Exit code for any other answer, a refused connection or a timeout (a container engine reads any non-zero code as unhealthy).</summary>
    public const int Unhealthy = 1;

    /// <summary>Exit code for a missing or unusable URL (64, EX_USAGE; 2 is reserved by container engines).</summary>
    public const int Usage = 64;

    /// <summary>How long the probe waits for the connection and the answer's headers.</summary>
    public static readonly TimeSpan DefaultTimeout = TimeSpan.FromSeconds(3);

    /// <summary>True when the command line asks for this mode.</summary>
    public static bool IsRequested(string[] args) =>
        args is { Length: > 0 } && string.Equals(args[0], Command, StringComparison.Ordinal);

    /// <summary>Probes the URL in <paramref name="args"/>[1] and returns the process exit code.</summary>
    /// <param name="args">The command line: <c>health-probe</c> and one absolute http(s) URL.</param>
    /// <param name="error">Where the reason for a non-zero code is written.</param>
    public static Task<int> RunAsync(string[] args, TextWriter error) => RunAsync(args, error, handler: null, DefaultTimeout);

    /// <summary>As <see cref="RunAsync(string[], TextWriter)"/>, through <paramref name="handler"/> when given (tests) and with a timeout.</summary>
    internal static async Task<int> RunAsync(string[] args, TextWriter error, HttpMessageHandler? handler, TimeSpan timeout)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(error);
        if (args.Length != 2 || !Uri.TryCreate(args[1], UriKind.Absolute, out var url) || (url.Scheme != Uri.UriSchemeHttp && url.Scheme != Uri.UriSchemeHttps))
        {
            await error.WriteLineAsync($"usage: {Command} http://127.0.0.1:8080/healthz (one absolute http or https URL)").ConfigureAwait(false);
            return Usage;
        }

        // No proxy: the probe asks the service in its own container, whatever HTTP_PROXY says.
        using var client = handler is null
            ? new HttpClient(new SocketsHttpHandler { UseProxy = false, ConnectTimeout = timeout }, disposeHandler: true)
            : new HttpClient(handler, disposeHandler: false);
        client.Timeout = timeout;
        try
        {
            using var response = await client.GetAsync(url, HttpCompletionOption.ResponseHeadersRead).ConfigureAwait(false);
            if (response.StatusCode == HttpStatusCode.OK)
            {
                return Healthy;
            }

            await error.WriteLineAsync($"{url} answered {(int)response.StatusCode}").ConfigureAwait(false);
            return Unhealthy;
        }
        catch (HttpRequestException e)
        {
            await error.WriteLineAsync($"{url}: {e.Message}").ConfigureAwait(false);
            return Unhealthy;
        }
        catch (TaskCanceledException)
        {
            await error.WriteLineAsync($"{url}: no answer within {timeout.TotalSeconds:0.#} s").ConfigureAwait(false);
            return Unhealthy;
        }
    }
}
