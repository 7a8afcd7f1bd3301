namespace Partwise.Api.Infrastructure;

/// <summary>
/// Gives every request an id, echoed in the <c>X-Request-Id</c> response header, in problem documents and in the
/// request's log event. A caller's own id is kept when it is sane (1 to 128 printable ASCII characters);
/// otherwise a new one is made.
/// </summary>
public static class RequestId
{
    /// <summary>The header name.</summary>
    public const string Header = "X-Request-Id";

    /// <summary>The longest caller id that is echoed.</summary>
    public const int MaxLength = 128;

    /// <summary>Adds the middleware; put it first so that every response, errors included, carries the header.</summary>
    public static IApplicationBuilder UseRequestId(this IApplicationBuilder app) =>
        app.Use(static (context, next) =>
        {
            var id = IsSane(context.Request.Headers[Header]) ? context.Request.Headers[Header].ToString() : Guid.NewGuid().ToString("N");
            context.TraceIdentifier = id;
            context.Response.OnStarting(static state =>
            {
                var http = (HttpContext)state;
                http.Response.Headers[Header] = http.TraceIdentifier;
                return Task.CompletedTask;
            }, context);
            return next(context);
        });

    /// <summary>True for exactly one value of 1 to 128 printable ASCII characters (space to tilde, not only spaces).</summary>
    public static bool IsSane(Microsoft.Extensions.Primitives.StringValues values)
    {
        if (values.Count != 1 || values[0] is not { Length: > 0 and <= MaxLength } value || string.IsNullOrWhiteSpace(value))
        {
            return false;
        }

        foreach (var c in value)
        {
            if (c is < ' ' or > '~')
            {
                return false;
            }
        }

        return true;
    }
}
