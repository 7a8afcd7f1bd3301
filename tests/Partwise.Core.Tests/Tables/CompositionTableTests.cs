using Partwise.Core.Problems;
using Partwise.Core.Tables;

namespace Partwise.Core.Tests.Tables;

public class CompositionTableTests
{
    [Fact]
    public void NegativeValueIsRejectedWithThePointerOfItsCell()
    {
        var ex = Assert.Throws<CompositionException>(() =>
            CompositionTable.FromRows(["a", "b", "c"], [[1, 2, 3], [1, -2, 3]]));
        Assert.Equal(ProblemTypes.NegativeValue, ex.ProblemType);
        Assert.Equal("/rows/1/1", Assert.Single(ex.Errors).Pointer);
    }

    [Fact]
    public void RaggedRowIsAnInvalidInputPointingAtTheRow()
    {
        var ex = Assert.Throws<CompositionException>(() =>
            CompositionTable.FromRows(["a", "b", "c"], [[1, 2, 3], [1, 2]]));
        Assert.Equal(ProblemTypes.InvalidInput, ex.ProblemType);
        Assert.Equal("/rows/1", ex.Errors[0].Pointer);
    }

    [Theory]
    [InlineData(new[] { "a" }, "/parts")]
    [InlineData(new[] { "a", "a" }, "/parts/1")]
    [InlineData(new[] { "a", "" }, "/parts/1")]
    public void BadPartNamesAreRejected(string[] parts, string pointer)
    {
        var rows = new[] { new double[parts.Length] };
        var ex = Assert.Throws<CompositionException>(() => CompositionTable.FromRows(parts, rows));
        Assert.Equal(pointer, ex.Errors[0].Pointer);
    }

    [Fact]
    public void NonFiniteValueIsRejected()
    {
        var ex = Assert.Throws<CompositionException>(() =>
            CompositionTable.FromRows(["a", "b"], [[double.NaN, 1]]));
        Assert.Equal(ProblemTypes.NonFiniteValue, ex.ProblemType);
        Assert.Equal("/rows/0/0", ex.Errors[0].Pointer);
    }

    [Fact]
    public void DuplicateIdIsRejected()
    {
        var ex = Assert.Throws<CompositionException>(() =>
            CompositionTable.FromRows(["a", "b"], [[1, 1], [2, 2]], ["x", "x"]));
        Assert.Equal("/ids/1", ex.Errors[0].Pointer);
    }

    [Fact]
    public void RowsAreStoredRowMajor()
    {
        var t = CompositionTable.FromRows(["a", "b", "c"], [[1, 2, 3], [4, 5, 6]]);
        Assert.Equal(2, t.RowCount);
        Assert.Equal(3, t.PartCount);
        Assert.Equal(new double[] { 4, 5, 6 }, t.Row(1).ToArray());
        Assert.Equal(2, t.IndexOf("c"));
        Assert.Equal(-1, t.IndexOf("d"));
    }
}
