using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Binds a JSON-only request body (no table in it): the media type must be JSON (else 415), the body within the
/// byte limit (else 413), and it is read with <see cref="RequestJson"/>'s rules (else 400 with a pointer).
/// </summary>
public static class JsonBody
{
    /// <summary>The binding for a request record's <c>BindAsync</c>.</summary>
    public static async ValueTask<T?> BindAsync<T>(HttpContext context)
        where T : class
    {
        ArgumentNullException.ThrowIfNull(context);
        if (RequestBody.FormatOf(context.Request) != BodyFormat.Json)
        {
            throw new CompositionException(ProblemTypes.UnsupportedMediaType, "", "This endpoint takes application/json only.");
        }

        var body = await RequestBody.ReadAsync(context).ConfigureAwait(false);
        return RequestJson.Deserialize<T>(body.Span);
    }
}
