using System.Globalization;
using System.Text;
using nietras.SeparatedValues;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Reads a <c>text/csv</c> body (RFC 4180: comma separated, double quotes for names with commas, UTF-8) into one
/// row-major array. Pointers in problems are those of the equivalent JSON request: <c>/parts/j</c> for a header
/// name, <c>/rows/i</c> for a row and <c>/rows/i/j</c> for a cell, i counting data rows from 0 after the header.
/// </summary>
public static class CsvTableReader
{
    /// <summary>Parses <paramref name="utf8"/>; blank lines are skipped.</summary>
    /// <param name="utf8">The body bytes.</param>
    /// <param name="maxColumns">The most columns accepted (without the id column); more is a 413.</param>
    /// <param name="maxRows">The most data rows accepted; more is a 413.</param>
    /// <exception cref="CompositionException">
    /// 400 <see cref="ProblemTypes.InvalidInput"/> for an empty body, a ragged row or a cell that is not a finite
    /// number; 413 <see cref="ProblemTypes.TooLarge"/> over the limits.
    /// </exception>
    public static CsvTable Read(ReadOnlyMemory<byte> utf8, int maxColumns, int maxRows)
    {
        var text = DecodeUtf8(utf8.Span);
        // The header is read as an ordinary row so that duplicate or empty names reach the table's own checks.
        using var reader = Sep.New(',').Reader(o => o with
        {
            HasHeader = false,
            Unescape = true,
            Trim = SepTrim.Outer,
            DisableColCountCheck = true,
            CultureInfo = CultureInfo.InvariantCulture,
        }).FromText(text);

        string[]? header = null;
        var hasIds = false;
        var width = 0;
        double[] values = [];
        List<string>? ids = null;
        var n = 0;
        foreach (var row in reader)
        {
            if (row.Span.IsWhiteSpace())
            {
                continue;
            }

            if (header is null)
            {
                header = new string[row.ColCount];
                for (var c = 0; c < header.Length; c++)
                {
                    header[c] = row[c].ToString();
                }

                hasIds = string.Equals(header[0], CsvTable.IdColumn, StringComparison.OrdinalIgnoreCase);
                width = header.Length - (hasIds ? 1 : 0);
                if (width > maxColumns)
                {
                    throw new CompositionException(ProblemTypes.TooLarge, "/parts", string.Create(CultureInfo.InvariantCulture, $"The table has {width} columns; at most {maxColumns} are accepted."));
                }

                values = new double[Math.Max(width, 1) * 64];
                ids = hasIds ? [] : null;
                continue;
            }

            if (row.ColCount != header.Length)
            {
                throw new CompositionException(
                    ProblemTypes.InvalidInput,
                    string.Create(CultureInfo.InvariantCulture, $"/rows/{n}"),
                    string.Create(CultureInfo.InvariantCulture, $"Row {n} (line {row.LineNumberFrom}) has {row.ColCount} fields but the header has {header.Length}."));
            }

            if (n == maxRows)
            {
                throw new CompositionException(ProblemTypes.TooLarge, "/rows", string.Create(CultureInfo.InvariantCulture, $"The table has more than {maxRows} rows, the most accepted."));
            }

            if ((long)(n + 1) * width > values.Length)
            {
                Array.Resize(ref values, (int)Math.Min(Array.MaxLength, Math.Max((long)values.Length * 2, (long)(n + 1) * width)));
            }

            var first = 0;
            if (ids is not null)
            {
                ids.Add(row[0].ToString());
                first = 1;
            }

            for (var c = 0; c < width; c++)
            {
                var cell = row[first + c].Span;
                if (!double.TryParse(cell, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !double.IsFinite(value))
                {
                    throw new CompositionException(
                        ProblemTypes.InvalidInput,
                        string.Create(CultureInfo.InvariantCulture, $"/rows/{n}/{c}"),
                        string.Create(CultureInfo.InvariantCulture, $"The cell in row {n} (line {row.LineNumberFrom}), column '{header[first + c]}', is not a finite number."));
                }

                values[(n * width) + c] = value;
            }

            n++;
        }

        if (header is null)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "", "The CSV body is empty; it needs a header row of part names and at least one row.");
        }

        var columns = header.Skip(hasIds ? 1 : 0).ToArray();
        Array.Resize(ref values, n * width);
        return new CsvTable(columns, values, ids);
    }

    private static string DecodeUtf8(ReadOnlySpan<byte> utf8)
    {
        if (utf8.StartsWith("\uFEFF"u8))
        {
            utf8 = utf8[3..];
        }

        try
        {
            return new UTF8Encoding(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true).GetString(utf8);
        }
        catch (DecoderFallbackException)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "", "The CSV body is not valid UTF-8.");
        }
    }
}
