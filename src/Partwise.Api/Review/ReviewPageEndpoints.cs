using System.Reflection;
using System.Security.Cryptography;

namespace Partwise.Api.Review;

/// <summary>
/// The review page at <c>/review</c>: plain HTML, CSS and JavaScript embedded in this assembly (so a build output or
/// a published folder serves it with nothing beside it), calling the API from the browser. The page itself takes no
/// credentials; its API calls send the key the reviewer enters.
/// </summary>
public static class ReviewPageEndpoints
{
    private static readonly Dictionary<string, (string ContentType, byte[] Body, string ETag)> Files = Load();

    /// <summary>
    /// Maps <c>GET /review</c> and its two assets, open to every caller (the page holds no data; its API calls carry
    /// the reviewer's key); none of them is part of the API contract.
    /// </summary>
    public static IEndpointRouteBuilder MapReviewPage(this IEndpointRouteBuilder app)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.MapGet("/review", (HttpContext context) => Serve(context, "index.html")).ExcludeFromDescription().AllowAnonymous();
        app.MapGet("/review/review.css", (HttpContext context) => Serve(context, "review.css")).ExcludeFromDescription().AllowAnonymous();
        app.MapGet("/review/review.js", (HttpContext context) => Serve(context, "review.js")).ExcludeFromDescription().AllowAnonymous();
        return app;
    }

    private static IResult Serve(HttpContext context, string name)
    {
        var (contentType, body, etag) = Files[name];
        var headers = context.Response.Headers;
        headers.ETag = etag;
        headers.CacheControl = "no-cache";
        headers.XContentTypeOptions = "nosniff";
        // The page loads only its own script and style and talks only to this service.
        headers.ContentSecurityPolicy = "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; connect-src 'self'; frame-ancestors 'none'";
        headers["Referrer-Policy"] = "no-referrer";
        if (context.Request.Headers.IfNoneMatch == etag)
        {
            return Results.StatusCode(StatusCodes.Status304NotModified);
        }

        return Results.Bytes(body, contentType);
    }

    private static Dictionary<string, (string, byte[], string)> Load()
    {
        var assembly = typeof(ReviewPageEndpoints).Assembly;
        var files = new Dictionary<string, (string, byte[], string)>(StringComparer.Ordinal);
        foreach (var (name, type) in new[] { ("index.html", "text/html; charset=utf-8"), ("review.css", "text/css; charset=utf-8"), ("review.js", "text/javascript; charset=utf-8") })
        {
            var body = Read(assembly, "review/" + name);
            files[name] = (type, body, $"\"{Convert.ToHexStringLower(SHA256.HashData(body))[..16]}\"");
        }

        return files;
    }

    private static byte[] Read(Assembly assembly, string resource)
    {
        using var stream = assembly.GetManifestResourceStream(resource)
            ?? throw new InvalidOperationException($"The review page resource {resource} is missing from the build.");
        using var copy = new MemoryStream();
        stream.CopyTo(copy);
        return copy.ToArray();
    }
}
