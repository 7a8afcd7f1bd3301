using System.Globalization;

namespace Partwise.Api.Infrastructure;

/// <summary>Where the service listens when nothing says otherwise.</summary>
public static class ListenAddress
{
    /// <summary>The default: loopback only, so a service started without setup is not reachable from the network.</summary>
    public const string Default = "http://127.0.0.1:5080";

    /// <summary>
    /// Listens on <see cref="Default"/> unless an address is configured: <c>urls</c> (ASPNETCORE_URLS, --urls),
    /// <c>http_ports</c> / <c>https_ports</c> (ASPNETCORE_HTTP_PORTS, as container images set), or
    /// <c>Kestrel:Endpoints</c>. A configured address that cannot be listened on stops the service here, with a
    /// message that names the setting.
    /// </summary>
    /// <exception cref="InvalidOperationException">An address in <c>urls</c> or a port in <c>http_ports</c> / <c>https_ports</c> is malformed.</exception>
    public static WebApplicationBuilder UseDefaultListenAddress(this WebApplicationBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        var configuration = builder.Configuration;
        if (Problems(configuration) is { Count: > 0 } problems)
        {
            throw new InvalidOperationException(string.Join(" ", problems));
        }

        var configured = !string.IsNullOrEmpty(configuration["urls"])
            || !string.IsNullOrEmpty(configuration["http_ports"])
            || !string.IsNullOrEmpty(configuration["https_ports"])
            || configuration.GetSection("Kestrel:Endpoints").GetChildren().Any();
        if (!configured)
        {
            builder.WebHost.UseUrls(Default);
        }

        return builder;
    }

    /// <summary>What is wrong with the configured addresses, empty when they can be listened on.</summary>
    public static IReadOnlyList<string> Problems(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var problems = new List<string>();
        foreach (var url in Entries(configuration["urls"]))
        {
            try
            {
                BindingAddress.Parse(url);
            }
            catch (FormatException)
            {
                problems.Add($"urls (ASPNETCORE_URLS, --urls): '{url}' is not an address to listen on, such as {Default} or http://0.0.0.0:8080; separate several with ';'.");
            }
        }

        foreach (var key in (string[])["http_ports", "https_ports"])
        {
            foreach (var port in Entries(configuration[key]))
            {
                if (!int.TryParse(port, NumberStyles.None, CultureInfo.InvariantCulture, out var number) || number is < 1 or > 65535)
                {
                    problems.Add($"{key} (ASPNETCORE_{key.ToUpperInvariant()}): '{port}' is not a port number from 1 to 65535; separate several with ';'.");
                }
            }
        }

        return problems;
    }

    private static string[] Entries(string? list) => (list ?? "").Split(';', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
}
