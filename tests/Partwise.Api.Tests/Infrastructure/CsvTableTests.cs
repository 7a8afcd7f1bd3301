using System.Text;
using Partwise.Api.Infrastructure;

namespace Partwise.Api.Tests.Infrastructure;

public class CsvTableTests
{
    [Fact]
    public void NamesWithCommasAndQuotesAreQuotedAndReadBack()
    {
        var table = new CsvTable(["Ca, total", "say \"hi\""], [1.5, 2.25, 3, 4], ["well-1", "well,2"]);
        var text = CsvTableWriter.Write(table);
        Assert.StartsWith("id,\"Ca, total\",\"say \"\"hi\"\"\"", text, StringComparison.Ordinal);
        var back = CsvTableReader.Read(Encoding.UTF8.GetBytes(text), 10, 10);
        Assert.Equal(table.Columns, back.Columns);
        Assert.Equal(table.Values, back.Values);
        Assert.Equal(table.Ids, back.Ids);
    }

    [Fact]
    public void NumbersAreWrittenInvariantWithRoundTripPrecision()
    {
        var values = new[] { Math.PI, 1e-300, -2.5e17, 0.1 + 0.2 };
        var text = CsvTableWriter.Write(new CsvTable(["a", "b", "c", "d"], values, null));
        var back = CsvTableReader.Read(Encoding.UTF8.GetBytes(text), 10, 10);
        Assert.Equal(values, back.Values);
        Assert.DoesNotContain(";", text, StringComparison.Ordinal);
    }

    [Fact]
    public void ABomCrLfLineEndsBlankLinesAndSpacesAreAccepted()
    {
        var bytes = Encoding.UTF8.GetPreamble().Concat(Encoding.UTF8.GetBytes("ID, a , b\r\n\r\nx, 1 , 2\r\ny,3,4\r\n\r\n")).ToArray();
        var table = CsvTableReader.Read(bytes, 10, 10);
        Assert.Equal(["a", "b"], table.Columns);
        Assert.Equal([1.0, 2, 3, 4], table.Values);
        Assert.Equal(["x", "y"], table.Ids!);
    }
}
