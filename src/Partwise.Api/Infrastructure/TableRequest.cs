using System.Globalization;
using Microsoft.Extensions.Options;
using Partwise.Core.Problems;
using Partwise.Core.Tables;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// A request whose table fields (<c>parts</c>, <c>rows</c>, <c>ids</c>) sit at its top level beside its options,
/// and which can also arrive as <c>text/csv</c> with its options in the query string.
/// </summary>
/// <typeparam name="TSelf">The request record.</typeparam>
public interface ITableRequest<TSelf>
    where TSelf : class, ITableRequest<TSelf>
{
    /// <summary>The part names (JSON bodies).</summary>
    IReadOnlyList<string>? Parts { get; }

    /// <summary>The rows (JSON bodies).</summary>
    IReadOnlyList<double[]>? Rows { get; }

    /// <summary>Optional row ids (JSON bodies).</summary>
    IReadOnlyList<string>? Ids { get; }

    /// <summary>The table when the body was <c>text/csv</c>; null for JSON.</summary>
    CsvTable? Csv { get; }

    /// <summary>The request for a <c>text/csv</c> body: the table read from it and the options from the query.</summary>
    static abstract TSelf FromCsv(CsvTable csv, IQueryCollection query);
}

/// <summary>Binds table requests from JSON or CSV bodies and checks their size limits.</summary>
public static class TableRequest
{
    /// <summary>
    /// The binding for a request record's <c>BindAsync</c>: reads the body under the byte limit, parses it as
    /// JSON or CSV, and checks the part and row limits. Failures are thrown as <see cref="CompositionException"/>
    /// and written as problem documents by the exception handler.
    /// </summary>
    public static async ValueTask<T?> BindAsync<T>(HttpContext context)
        where T : class, ITableRequest<T>
    {
        ArgumentNullException.ThrowIfNull(context);
        var format = RequestBody.FormatOf(context.Request);
        var body = await RequestBody.ReadAsync(context).ConfigureAwait(false);
        var limits = context.RequestServices.GetRequiredService<IOptions<LimitsOptions>>().Value;
        T request;
        if (format == BodyFormat.Csv)
        {
            request = T.FromCsv(CsvTableReader.Read(body, limits.MaxParts, limits.MaxRows), context.Request.Query);
        }
        else
        {
            request = RequestJson.Deserialize<T>(body.Span);
            CheckLimits(request.Parts?.Count ?? 0, request.Rows?.Count ?? 0, limits);
        }

        return request;
    }

    /// <summary>Refuses a table over <see cref="LimitsOptions.MaxParts"/> or <see cref="LimitsOptions.MaxRows"/> with a 413.</summary>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.TooLarge"/>.</exception>
    public static void CheckLimits(int parts, int rows, LimitsOptions limits)
    {
        ArgumentNullException.ThrowIfNull(limits);
        if (parts > limits.MaxParts)
        {
            throw new CompositionException(ProblemTypes.TooLarge, "/parts", string.Create(CultureInfo.InvariantCulture, $"The table has {parts} parts; at most {limits.MaxParts} are accepted."));
        }

        if (rows > limits.MaxRows)
        {
            throw new CompositionException(ProblemTypes.TooLarge, "/rows", string.Create(CultureInfo.InvariantCulture, $"The table has {rows} rows; at most {limits.MaxRows} are accepted."));
        }
    }

    /// <summary>
    /// The validated composition table of a request: from the CSV body, or from the JSON fields <c>parts</c>,
    /// <c>rows</c> and <c>ids</c>.
    /// </summary>
    /// <exception cref="CompositionException">Missing fields (400) or the table's own checks.</exception>
    public static CompositionTable ToTable<T>(this T request)
        where T : class, ITableRequest<T>
    {
        ArgumentNullException.ThrowIfNull(request);
        if (request.Csv is { } csv)
        {
            return CompositionTable.FromValues(csv.Columns, csv.Values, csv.Ids);
        }

        var parts = request.Parts ?? throw Missing("/parts", "The table needs \"parts\": the part names.");
        var rows = request.Rows ?? throw Missing("/rows", "The table needs \"rows\": one array of values per sample.");
        return CompositionTable.FromRows(parts, rows, request.Ids);
    }

    /// <summary>A 400 for a missing required member.</summary>
    public static CompositionException Missing(string pointer, string detail) => new(ProblemTypes.InvalidInput, pointer, detail);

}
