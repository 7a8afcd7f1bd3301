using System.Text.Json;
using System.Text.Json.Serialization;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// A matrix in a response, kept row-major as the math library computes it and written as a JSON array of row
/// arrays (<c>[[1, 2], [3, 4]]</c>) without copying it into jagged arrays first.
/// </summary>
/// <param name="Values">n × k values, row-major.</param>
/// <param name="ColumnCount">k.</param>
[JsonConverter(typeof(RowMajorConverter))]
public sealed record RowMajor(double[] Values, int ColumnCount)
{
    /// <summary>n.</summary>
    public int RowCount => ColumnCount == 0 ? 0 : Values.Length / ColumnCount;

    /// <summary>Row <paramref name="i"/>.</summary>
    public ReadOnlySpan<double> Row(int i) => Values.AsSpan(i * ColumnCount, ColumnCount);
}

/// <summary>Writes a <see cref="RowMajor"/> as an array of row arrays; reads one back (for tests and clients in .NET).</summary>
public sealed class RowMajorConverter : JsonConverter<RowMajor>
{
    /// <inheritdoc />
    public override RowMajor Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options)
    {
        var rows = JsonSerializer.Deserialize<double[]?[]>(ref reader, options) ?? [];
        // A null row ([[1, 2], null]) is bad input, not a null dereference further on.
        if (rows.Any(r => r is null))
        {
            throw new JsonException("Every row of a matrix is an array of numbers, not null.");
        }

        var k = rows.Length == 0 ? 0 : rows[0]!.Length;
        if (rows.Any(r => r!.Length != k))
        {
            throw new JsonException("Every row of a matrix has the same length.");
        }

        return new RowMajor(rows.SelectMany(r => r!).ToArray(), k);
    }

    /// <inheritdoc />
    public override void Write(Utf8JsonWriter writer, RowMajor value, JsonSerializerOptions options)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(value);
        writer.WriteStartArray();
        for (var i = 0; i < value.RowCount; i++)
        {
            writer.WriteStartArray();
            foreach (var v in value.Row(i))
            {
                writer.WriteNumberValue(v);
            }

            writer.WriteEndArray();
        }

        writer.WriteEndArray();
    }
}
