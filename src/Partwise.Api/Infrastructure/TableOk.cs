using System.Reflection;
using System.Text;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Http.Metadata;
using Microsoft.Net.Http.Headers;

namespace Partwise.Api.Infrastructure;

/// <summary>A response that is, or holds, one table and can therefore also be written as <c>text/csv</c>.</summary>
public interface ICsvResponse
{
    /// <summary>The table to write when the caller asks for <c>text/csv</c>.</summary>
    CsvTable ToCsv();

    /// <summary>The number of imputed cells (null where no zero policy applies), sent in the <c>Imputed-Cells</c> header of a CSV response (which has no room for the list).</summary>
    int? ImputedCount { get; }
}

/// <summary>
/// A 200 whose body is JSON, or CSV when the caller's <c>Accept</c> prefers <c>text/csv</c>. Declares the JSON
/// schema for the OpenAPI document; the CSV variant is added there by <c>CsvOperationFilter</c>.
/// </summary>
/// <typeparam name="T">The JSON response record.</typeparam>
public sealed class TableOk<T> : IResult, IEndpointMetadataProvider, IStatusCodeHttpResult, IValueHttpResult, IValueHttpResult<T>
    where T : ICsvResponse
{
    /// <summary>The header that tells a CSV caller how many cells a zero policy replaced.</summary>
    public const string ImputedHeader = "Imputed-Cells";

    internal TableOk(T value) => Value = value;

    /// <summary>The response.</summary>
    public T Value { get; }

    object? IValueHttpResult.Value => Value;

    /// <inheritdoc />
    public int? StatusCode => StatusCodes.Status200OK;

    /// <inheritdoc />
    public Task ExecuteAsync(HttpContext httpContext)
    {
        ArgumentNullException.ThrowIfNull(httpContext);
        if (!Negotiation.PrefersCsv(httpContext.Request))
        {
            return TypedResults.Ok(Value).ExecuteAsync(httpContext);
        }

        var text = CsvTableWriter.Write(Value.ToCsv());
        httpContext.Response.StatusCode = StatusCodes.Status200OK;
        if (Value.ImputedCount is { } imputed)
        {
            httpContext.Response.Headers[ImputedHeader] = imputed.ToString(System.Globalization.CultureInfo.InvariantCulture);
        }

        httpContext.Response.ContentType = "text/csv; charset=utf-8";
        return httpContext.Response.WriteAsync(text, Encoding.UTF8, httpContext.RequestAborted);
    }

    /// <inheritdoc />
    public static void PopulateMetadata(MethodInfo method, EndpointBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        builder.Metadata.Add(new ProducesResponseTypeMetadata(StatusCodes.Status200OK, typeof(T), ["application/json"]));
        builder.Metadata.Add(CsvResponseMetadata.Instance);
    }
}

/// <summary>Marks an endpoint whose 200 can also be <c>text/csv</c>.</summary>
public sealed class CsvResponseMetadata
{
    /// <summary>The one instance.</summary>
    public static CsvResponseMetadata Instance { get; } = new();
}

/// <summary>Factory for <see cref="TableOk{T}"/>.</summary>
public static class TableResults
{
    /// <summary>A 200 with <paramref name="value"/> as JSON or CSV.</summary>
    public static TableOk<T> Ok<T>(T value)
        where T : ICsvResponse => new(value);
}

/// <summary>Content negotiation between JSON (the default) and CSV.</summary>
public static class Negotiation
{
    /// <summary>
    /// True when <c>Accept</c> names <c>text/csv</c> with a quality above zero and above that of
    /// <c>application/json</c>. Wildcards never choose CSV, and a tie goes to JSON, the default.
    /// </summary>
    public static bool PrefersCsv(HttpRequest request) => Prefers(request, CsvTable.MediaType);

    /// <summary>
    /// True when <c>Accept</c> names <paramref name="mediaType"/> with a quality above zero and above that of
    /// <c>application/json</c>. Wildcards never choose it, and a tie goes to JSON, the default.
    /// </summary>
    public static bool Prefers(HttpRequest request, string mediaType)
    {
        ArgumentNullException.ThrowIfNull(request);
        if (!MediaTypeHeaderValue.TryParseList(request.Headers.Accept, out var accepted))
        {
            return false;
        }

        double wanted = 0, json = 0;
        foreach (var media in accepted)
        {
            var q = media.Quality ?? 1.0;
            if (media.MediaType.Equals(mediaType, StringComparison.OrdinalIgnoreCase))
            {
                wanted = Math.Max(wanted, q);
            }
            else if (media.MediaType.Equals("application/json", StringComparison.OrdinalIgnoreCase))
            {
                json = Math.Max(json, q);
            }
        }

        return wanted > 0 && wanted > json;
    }
}
