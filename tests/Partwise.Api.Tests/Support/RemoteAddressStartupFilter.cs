using System.Net;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;

namespace Partwise.Api.Tests.Support;

/// <summary>
/// Stands in for the socket the in-process test server lacks: before anything else in the pipeline, a request
/// without a remote address gets the given one (if any). The service itself never guesses an unknown address.
/// </summary>
public sealed class RemoteAddressStartupFilter(Func<IPAddress?> address) : IStartupFilter
{
    public Action<IApplicationBuilder> Configure(Action<IApplicationBuilder> next) => app =>
    {
        app.Use((context, following) =>
        {
            context.Connection.RemoteIpAddress ??= address();
            return following(context);
        });
        next(app);
    };
}
