namespace Partwise.Api.Infrastructure;

/// <summary>Where the service listens when nothing says otherwise.</summary>
public static class ListenAddress
{
    /// <summary>The default: loopback only, so a service started without setup is not reachable from the network.</summary>
    public const string Default = "http://127.0.0.1:5080";

    /// <summary>
    /// Listens on <see cref="Default"/> unless an address is configured: <c>urls</c> (ASPNETCORE_URLS, --urls),
    /// <c>http_ports</c> / <c>https_ports</c> (ASPNETCORE_HTTP_PORTS, as container images set), or
    /// <c>Kestrel:Endpoints</c>.
    /// </summary>
    public static WebApplicationBuilder UseDefaultListenAddress(this WebApplicationBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        var configuration = builder.Configuration;
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
}
