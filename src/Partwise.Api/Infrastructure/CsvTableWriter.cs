using System.Globalization;
using nietras.SeparatedValues;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Writes a <see cref="CsvTable"/> as RFC 4180 CSV: a header (with a first column <c>id</c> when the table has
/// ids), numbers in invariant culture with round-trip formatting, names quoted where they need it.
/// </summary>
public static class CsvTableWriter
{
    /// <summary>The CSV text of <paramref name="table"/>.</summary>
    public static string Write(CsvTable table)
    {
        ArgumentNullException.ThrowIfNull(table);
        // The header is written as an ordinary row: column labels need not be unique (a ratio set may repeat one).
        using var writer = Sep.New(',').Writer(o => o with { WriteHeader = false, Escape = true, CultureInfo = CultureInfo.InvariantCulture }).ToText();
        var k = table.Columns.Count;
        var hasIds = table.Ids is not null;
        var first = hasIds ? 1 : 0;
        using (var header = writer.NewRow())
        {
            if (hasIds)
            {
                header[0].Set(CsvTable.IdColumn);
            }

            for (var c = 0; c < k; c++)
            {
                header[first + c].Set(table.Columns[c]);
            }
        }

        Span<char> buffer = stackalloc char[32];
        for (var i = 0; i < table.RowCount; i++)
        {
            using var row = writer.NewRow();
            if (hasIds)
            {
                row[0].Set(table.Ids![i]);
            }

            for (var c = 0; c < k; c++)
            {
                var value = table.Values[(i * k) + c];
                row[first + c].Set(value.TryFormat(buffer, out var written, "R", CultureInfo.InvariantCulture) ? buffer[..written] : value.ToString("R", CultureInfo.InvariantCulture));
            }
        }

        writer.Flush();
        return writer.ToString();
    }
}
