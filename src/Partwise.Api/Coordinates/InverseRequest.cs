using System.ComponentModel.DataAnnotations;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;

namespace Partwise.Api.Coordinates;

/// <summary>Coordinates to transform back into closed compositions.</summary>
public sealed record InverseRequest : ITableRequest<InverseRequest>
{
    /// <summary>The part names of the compositions, in the order the coordinates were made with.</summary>
    [Required]
    public IReadOnlyList<string>? Parts { get; init; }

    /// <summary>One array of coordinates per sample: J values for clr, J − 1 for alr and ilr.</summary>
    [Required]
    public IReadOnlyList<double[]>? Rows { get; init; }

    /// <summary>Optional sample ids, carried to the result.</summary>
    public IReadOnlyList<string>? Ids { get; init; }

    /// <summary>The transform the coordinates were made with (required): the same <c>denominator</c> or <c>partition</c>.</summary>
    [Required]
    public TransformOption? Transform { get; init; }

    /// <summary>The closure total κ &gt; 0; default 1.</summary>
    public double? Total { get; init; }

    /// <inheritdoc />
    [JsonIgnore]
    public CsvTable? Csv { get; init; }

    /// <inheritdoc />
    public static InverseRequest FromCsv(CsvTable csv, IQueryCollection query)
    {
        ArgumentNullException.ThrowIfNull(query);
        return new()
        {
            Csv = csv,
            Parts = QueryOptions.List(query, "parts"),
            Transform = TransformOption.FromQuery(query),
            Total = QueryOptions.Number(query, "total", "/total"),
        };
    }

    /// <summary>Binds the request from a JSON or CSV body.</summary>
    public static ValueTask<InverseRequest?> BindAsync(HttpContext context) => TableRequest.BindAsync<InverseRequest>(context);
}
