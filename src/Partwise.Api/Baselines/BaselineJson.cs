using System.Text.Json;
using System.Text.Json.Serialization;
using Partwise.Api.Infrastructure;

namespace Partwise.Api.Baselines;

/// <summary>How baseline documents and screening results are written to and read from the store: the wire format.</summary>
public static class BaselineJson
{
    /// <summary>camelCase, numbers as JSON numbers, absent members for nulls (except those marked to be written).</summary>
    public static JsonSerializerOptions Options { get; } = new(RequestJson.Options)
    {
        DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
    };

    /// <summary>The JSON text of <paramref name="value"/>.</summary>
    public static string Write<T>(T value) => JsonSerializer.Serialize(value, Options);

    /// <summary>Reads JSON text the service wrote itself.</summary>
    public static T Read<T>(string json)
        where T : class =>
        JsonSerializer.Deserialize<T>(json, Options) ?? throw new InvalidOperationException("The stored JSON is null.");
}
