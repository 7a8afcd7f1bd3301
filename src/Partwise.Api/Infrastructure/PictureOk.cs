using System.Reflection;
using System.Text;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Http.Metadata;
using Microsoft.Net.Http.Headers;

namespace Partwise.Api.Infrastructure;

/// <summary>A response that can also be drawn as a picture.</summary>
public interface IPictureResponse
{
    /// <summary>The picture as a standalone SVG document, written when the caller asks for <c>image/svg+xml</c>.</summary>
    string ToSvg();
}

/// <summary>
/// A 200 whose body is JSON, or SVG when the caller's <c>Accept</c> prefers <c>image/svg+xml</c>. Declares the JSON
/// schema for the OpenAPI document; the SVG variant is added there by <c>PictureOperationFilter</c>.
/// </summary>
/// <typeparam name="T">The JSON response record.</typeparam>
public sealed class PictureOk<T> : IResult, IEndpointMetadataProvider, IStatusCodeHttpResult, IValueHttpResult, IValueHttpResult<T>
    where T : IPictureResponse
{
    internal PictureOk(T value) => Value = value;

    /// <summary>The response.</summary>
    public T Value { get; }

    object? IValueHttpResult.Value => Value;

    /// <inheritdoc />
    public int? StatusCode => StatusCodes.Status200OK;

    /// <inheritdoc />
    public Task ExecuteAsync(HttpContext httpContext)
    {
        ArgumentNullException.ThrowIfNull(httpContext);
        if (!PictureNegotiation.PrefersSvg(httpContext.Request))
        {
            return TypedResults.Ok(Value).ExecuteAsync(httpContext);
        }

        httpContext.Response.StatusCode = StatusCodes.Status200OK;
        httpContext.Response.ContentType = PictureNegotiation.SvgMediaType + "; charset=utf-8";
        return httpContext.Response.WriteAsync(Value.ToSvg(), Encoding.UTF8, httpContext.RequestAborted);
    }

    /// <inheritdoc />
    public static void PopulateMetadata(MethodInfo method, EndpointBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        builder.Metadata.Add(new ProducesResponseTypeMetadata(StatusCodes.Status200OK, typeof(T), ["application/json"]));
        builder.Metadata.Add(SvgResponseMetadata.Instance);
    }
}

/// <summary>Marks an endpoint whose 200 can also be <c>image/svg+xml</c>.</summary>
public sealed class SvgResponseMetadata
{
    /// <summary>The one instance.</summary>
    public static SvgResponseMetadata Instance { get; } = new();
}

/// <summary>Factory for <see cref="PictureOk{T}"/>.</summary>
public static class PictureResults
{
    /// <summary>A 200 with <paramref name="value"/> as JSON or SVG.</summary>
    public static PictureOk<T> Ok<T>(T value)
        where T : IPictureResponse => new(value);
}

/// <summary>Content negotiation between JSON (the default) and SVG.</summary>
public static class PictureNegotiation
{
    /// <summary>The SVG media type.</summary>
    public const string SvgMediaType = "image/svg+xml";

    /// <summary>
    /// True when <c>Accept</c> names <c>image/svg+xml</c> with a quality above zero and above that of
    /// <c>application/json</c>. Wildcards (<c>*/*</c>, <c>image/*</c>) never choose SVG, and a tie goes to JSON.
    /// </summary>
    public static bool PrefersSvg(HttpRequest request) => Negotiation.Prefers(request, SvgMediaType);
}
