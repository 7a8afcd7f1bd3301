using System.Text.Json;

namespace Partwise.Api.Shapes;

/// <summary>Reading and writing JSON objects from name to finite number, for the converters of option shapes.</summary>
internal static class NumberMaps
{
    /// <summary>Reads an object whose members are all finite numbers; names must be unique.</summary>
    public static Dictionary<string, double> Read(ref Utf8JsonReader reader)
    {
        var map = new Dictionary<string, double>(StringComparer.Ordinal);
        while (reader.Read() && reader.TokenType != JsonTokenType.EndObject)
        {
            var name = reader.GetString()!;
            if (!reader.Read() || reader.TokenType != JsonTokenType.Number)
            {
                throw new JsonException($"The value for '{name}' is not a number.");
            }

            if (!map.TryAdd(name, ReadFinite(ref reader)))
            {
                throw new JsonException($"The name '{name}' appears more than once.");
            }
        }

        return map;
    }

    /// <summary>Reads the current number token, refusing one outside the double range.</summary>
    public static double ReadFinite(ref Utf8JsonReader reader)
    {
        var value = reader.GetDouble();
        return double.IsFinite(value) ? value : throw new JsonException("The number is outside the range of a double (about ±1.8e308).");
    }

    /// <summary>Writes a map as a JSON object.</summary>
    public static void Write(Utf8JsonWriter writer, IReadOnlyDictionary<string, double> map)
    {
        writer.WriteStartObject();
        foreach (var (name, value) in map)
        {
            writer.WriteNumber(name, value);
        }

        writer.WriteEndObject();
    }
}
