using System.Globalization;
using System.Text;

namespace Partwise.Benchmarks.Http;

/// <summary>A seeded 100,000 × 20 table as the JSON body of <c>POST /v1/coordinates</c> (ilr, reject policy).</summary>
public static class CoordinatesBodies
{
    /// <summary>
    /// The UTF-8 body: parts, rows of log-normal values printed with round-trip precision, and the transform. It is
    /// written straight as UTF-8 so that making it costs little more memory than the body itself.
    /// </summary>
    public static byte[] Create(int rows, int parts, int seed = 20261202)
    {
        var random = new Random(seed);
        using var stream = new MemoryStream(rows * parts * 20);
        void Write(string text) => stream.Write(Encoding.UTF8.GetBytes(text));
        Write("{\"parts\":[" + string.Join(',', Enumerable.Range(0, parts).Select(j => $"\"p{j}\"")) + "],\"rows\":[");
        Span<byte> number = stackalloc byte[32];
        for (var i = 0; i < rows; i++)
        {
            stream.WriteByte(i == 0 ? (byte)'[' : (byte)',');
            if (i > 0)
            {
                stream.WriteByte((byte)'[');
            }

            for (var j = 0; j < parts; j++)
            {
                if (j > 0)
                {
                    stream.WriteByte((byte)',');
                }

                Math.Exp(4 * random.NextDouble()).TryFormat(number, out var written, "R", CultureInfo.InvariantCulture);
                stream.Write(number[..written]);
            }

            stream.WriteByte((byte)']');
        }

        Write("],\"transform\":{\"type\":\"ilr\"}}");
        return stream.ToArray();
    }
}

/// <summary>What System.Text.Json alone reads from the body: the baseline of the end-to-end benchmark.</summary>
public sealed record TableBody(string[] Parts, double[][] Rows);
