using System.Globalization;
using Microsoft.Extensions.Options;
using Microsoft.Net.Http.Headers;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>The two media types a table endpoint takes.</summary>
public enum BodyFormat
{
    /// <summary><c>application/json</c> (or any <c>+json</c> type), UTF-8.</summary>
    Json,

    /// <summary><c>text/csv</c>, UTF-8; options come as query parameters.</summary>
    Csv,
}

/// <summary>
/// Reads a request body into memory under the configured byte limit, after checking its media type. Buffering
/// (at most <see cref="LimitsOptions.MaxBodyBytes"/>) lets the JSON and CSV parsers run without blocking I/O.
/// </summary>
public static class RequestBody
{
    /// <summary>The media type of the body, or a 415 problem.</summary>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.UnsupportedMediaType"/>.</exception>
    public static BodyFormat FormatOf(HttpRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        if (MediaTypeHeaderValue.TryParse(request.ContentType, out var type) && type.MediaType.HasValue)
        {
            var media = type.MediaType.Value;
            if (media.Equals("application/json", StringComparison.OrdinalIgnoreCase)
                || (media.StartsWith("application/", StringComparison.OrdinalIgnoreCase) && media.EndsWith("+json", StringComparison.OrdinalIgnoreCase)))
            {
                return BodyFormat.Json;
            }

            if (media.Equals(CsvTable.MediaType, StringComparison.OrdinalIgnoreCase))
            {
                return BodyFormat.Csv;
            }
        }

        var given = string.IsNullOrEmpty(request.ContentType) ? "no Content-Type" : $"Content-Type '{request.ContentType}'";
        throw new CompositionException(ProblemTypes.UnsupportedMediaType, "", $"The body has {given}; send application/json or text/csv.");
    }

    /// <summary>Reads the whole body, refusing it with a 413 as soon as it passes the limit.</summary>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.TooLarge"/>.</exception>
    public static async Task<ReadOnlyMemory<byte>> ReadAsync(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var limit = context.RequestServices.GetRequiredService<IOptions<LimitsOptions>>().Value.MaxBodyBytes;
        var declared = context.Request.ContentLength;
        if (declared > limit)
        {
            throw TooLarge(limit);
        }

        using var buffer = new MemoryStream(declared is > 0 and <= int.MaxValue ? (int)declared.Value : 4096);
        var chunk = new byte[81920];
        int read;
        while ((read = await context.Request.Body.ReadAsync(chunk, context.RequestAborted).ConfigureAwait(false)) > 0)
        {
            if (buffer.Length + read > limit)
            {
                throw TooLarge(limit);
            }

            buffer.Write(chunk, 0, read);
        }

        return buffer.GetBuffer().AsMemory(0, (int)buffer.Length);
    }

    private static CompositionException TooLarge(long limit) =>
        new(ProblemTypes.TooLarge, "", string.Create(CultureInfo.InvariantCulture, $"The body is larger than {limit} bytes, the most accepted."));
}
