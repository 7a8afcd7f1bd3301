using System.Globalization;
using System.Text.Json;
using System.Text.Json.Serialization;
using System.Text.RegularExpressions;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// How request bodies are read: camelCase names matched exactly, numbers only as JSON numbers (no NaN, no
/// Infinity, no numbers in strings), no duplicate members, and unknown members ignored so that a caller built
/// against a later version of the contract still works here.
/// </summary>
public static partial class RequestJson
{
    /// <summary>The serializer options for every request body.</summary>
    public static JsonSerializerOptions Options { get; } = CreateOptions();

    /// <summary>
    /// Deserializes a UTF-8 body, turning every JSON error into a 400 <see cref="ProblemTypes.InvalidInput"/> whose
    /// pointer names the offending place.
    /// </summary>
    /// <exception cref="CompositionException">The body is not JSON, or a value has the wrong JSON type.</exception>
    public static T Deserialize<T>(ReadOnlySpan<byte> utf8)
        where T : class
    {
        if (utf8.StartsWith("\uFEFF"u8))
        {
            utf8 = utf8[3..];
        }

        try
        {
            return JsonSerializer.Deserialize<T>(utf8, Options)
                ?? throw new CompositionException(ProblemTypes.InvalidInput, "", "The body must be a JSON object, not null.");
        }
        catch (JsonException e)
        {
            throw ToProblem(e);
        }
    }

    /// <summary>The 400 problem for a serializer error, with its path as a JSON pointer and a detail free of .NET type names.</summary>
    public static CompositionException ToProblem(JsonException exception)
    {
        ArgumentNullException.ThrowIfNull(exception);
        var pointer = JsonPathPointer.ToPointer(exception.Path);
        var message = exception.Message;
        var cut = message.IndexOf(" Path: ", StringComparison.Ordinal);
        if (cut >= 0)
        {
            message = message[..cut];
        }

        var conversion = ConversionMessage().Match(message);
        if (conversion.Success)
        {
            message = $"The value here is not {Describe(conversion.Groups["type"].Value)}.";
        }
        else if (message.Contains("could not be converted", StringComparison.Ordinal) || message.Contains("System.", StringComparison.Ordinal))
        {
            message = "The value here has the wrong JSON type.";
        }

        var where = exception.LineNumber is { } line && exception.BytePositionInLine is { } column
            ? string.Create(CultureInfo.InvariantCulture, $" (line {line + 1}, byte {column + 1})")
            : "";
        var detail = $"The body is not a valid request: {message}{where}";
        return new CompositionException(ProblemTypes.InvalidInput, pointer, detail);
    }

    private static string Describe(string dotnetType) => dotnetType switch
    {
        "System.Double" or "System.Nullable`1[System.Double]" => "a number",
        "System.Int32" or "System.Nullable`1[System.Int32]" => "an integer",
        "System.String" => "a string",
        _ when dotnetType.EndsWith("[]", StringComparison.Ordinal) || dotnetType.Contains("List`1", StringComparison.Ordinal) => "an array",
        _ when dotnetType.Contains("Dictionary`2", StringComparison.Ordinal) => "an object",
        _ => "of the expected JSON type (see the OpenAPI schema)",
    };

    private static JsonSerializerOptions CreateOptions()
    {
        var options = new JsonSerializerOptions(JsonSerializerDefaults.General)
        {
            PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
            PropertyNameCaseInsensitive = false,
            NumberHandling = JsonNumberHandling.Strict,
            AllowDuplicateProperties = false,
            UnmappedMemberHandling = JsonUnmappedMemberHandling.Skip,
            ReadCommentHandling = JsonCommentHandling.Disallow,
            AllowTrailingCommas = false,
        };
        options.Converters.Add(new FiniteDoubleConverter());
        options.MakeReadOnly(populateMissingResolver: true);
        return options;
    }

    [GeneratedRegex(@"could not be converted to (?<type>[^ ]+?)\.?$")]
    private static partial Regex ConversionMessage();
}

/// <summary>
/// Reads a JSON number as a double and refuses one outside the double range (such as 1e400), which the
/// serializer would otherwise turn into infinity. NaN and Infinity literals are not JSON and fail before this.
/// </summary>
public sealed class FiniteDoubleConverter : JsonConverter<double>
{
    /// <inheritdoc />
    public override double Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options)
    {
        if (reader.TokenType != JsonTokenType.Number)
        {
            throw new JsonException("The value here is not a number.");
        }

        var value = reader.GetDouble();
        return double.IsFinite(value) ? value : throw new JsonException("The number is outside the range of a double (about ±1.8e308).");
    }

    /// <inheritdoc />
    public override void Write(Utf8JsonWriter writer, double value, JsonSerializerOptions options)
    {
        ArgumentNullException.ThrowIfNull(writer);
        writer.WriteNumberValue(value);
    }
}
