using System.Text.Json;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;
using Partwise.Core.Problems;
using Partwise.Core.Variance;

namespace Partwise.Api.Shapes;

/// <summary>
/// Part weights (<c>"weights"</c>): <c>"equal"</c> (default), <c>"mean"</c> (mean closed proportions,
/// Greenacre &amp; Lewi 2009) or an object from every part to a positive number (normalised to sum 1).
/// </summary>
/// <param name="Mode"><c>equal</c> or <c>mean</c> when given as a string; null for a map.</param>
/// <param name="Map">The weight per part when given as an object; null otherwise.</param>
[JsonConverter(typeof(WeightsOptionConverter))]
public sealed record WeightsOption(string? Mode, IReadOnlyDictionary<string, double>? Map)
{
    /// <summary>The Core specification; absent means equal weights.</summary>
    /// <exception cref="CompositionException">400 for an unknown mode name.</exception>
    public static PartWeightSpec ToSpec(WeightsOption? option, string pointer = "/weights")
    {
        if (option is null)
        {
            return PartWeightSpec.Equal;
        }

        if (option.Map is { } map)
        {
            return PartWeightSpec.Given(map);
        }

        return option.Mode switch
        {
            "equal" => PartWeightSpec.Equal,
            "mean" => PartWeightSpec.Mean,
            _ => throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The weights '{option.Mode}' are unknown; use \"equal\", \"mean\" or an object from part name to a positive number."),
        };
    }

    /// <summary>The option from the query parameter <c>weights</c> (<c>equal</c> or <c>mean</c>) or <c>weight.PART</c> numbers.</summary>
    public static WeightsOption? FromQuery(IQueryCollection query, string pointer = "/weights")
    {
        var mode = QueryOptions.Text(query, "weights", pointer);
        var map = QueryOptions.NumberMap(query, "weight", pointer);
        return map is not null ? new WeightsOption(null, map) : mode is null ? null : new WeightsOption(mode, null);
    }
}

/// <summary>Reads <c>weights</c> as a string or an object from part name to number.</summary>
public sealed class WeightsOptionConverter : JsonConverter<WeightsOption>
{
    /// <inheritdoc />
    public override WeightsOption Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options) =>
        reader.TokenType switch
        {
            JsonTokenType.String => new WeightsOption(reader.GetString(), null),
            JsonTokenType.StartObject => new WeightsOption(null, NumberMaps.Read(ref reader)),
            _ => throw new JsonException("\"weights\" is \"equal\", \"mean\" or an object from part name to a positive number."),
        };

    /// <inheritdoc />
    public override void Write(Utf8JsonWriter writer, WeightsOption value, JsonSerializerOptions options)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(value);
        if (value.Map is { } map)
        {
            NumberMaps.Write(writer, map);
            return;
        }

        writer.WriteStringValue(value.Mode);
    }
}
