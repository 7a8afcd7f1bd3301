using Partwise.Core.Problems;
using Partwise.Core.Transforms;

namespace Partwise.Core.Tests.Transforms;

public class PartitionValidationTests
{
    private static readonly string[] Parts = ["a", "b", "c", "d"];

    [Fact]
    public void RowsMayComeInAnyOrderThatFormsAHierarchy()
    {
        var basis = SequentialBinaryPartition.ToBasis(Parts, [[0, 0, 1, -1], [1, 1, -1, -1], [1, -1, 0, 0]]);
        Assert.Equal(["g(c)/g(d)", "g(a,b)/g(c,d)", "g(a)/g(b)"], basis.Labels);
    }

    [Fact]
    public void AFirstSplitThatLeavesAPartOutIsNotAPartition()
    {
        var ex = Assert.Throws<CompositionException>(() => SequentialBinaryPartition.ToBasis(Parts, [[1, 1, -1, 0], [1, -1, 0, 0], [0, 0, 1, -1]]));
        Assert.Equal(ProblemTypes.InvalidPartition, ex.ProblemType);
        Assert.StartsWith("/transform/partition/", ex.Errors[0].Pointer, StringComparison.Ordinal);
    }

    [Fact]
    public void ASplitAcrossTwoGroupsIsNotAPartition()
    {
        var ex = Assert.Throws<CompositionException>(() => SequentialBinaryPartition.ToBasis(Parts, [[1, 1, -1, -1], [1, 0, -1, 0], [0, 1, 0, -1]]));
        Assert.Equal("/transform/partition/1", ex.Errors[0].Pointer);
    }

    [Fact]
    public void WrongRowCountSignOrLengthIsRefusedWithItsPointer()
    {
        Assert.Equal("/transform/partition", Assert.Throws<CompositionException>(() => SequentialBinaryPartition.ToBasis(Parts, [[1, 1, -1, -1]])).Errors[0].Pointer);
        Assert.Equal("/transform/partition/1/2", Assert.Throws<CompositionException>(() => SequentialBinaryPartition.ToBasis(Parts, [[1, 1, -1, -1], [1, -1, 2, 0], [0, 0, 1, -1]])).Errors[0].Pointer);
        Assert.Equal("/transform/partition/2", Assert.Throws<CompositionException>(() => SequentialBinaryPartition.ToBasis(Parts, [[1, 1, -1, -1], [1, -1, 0, 0], [0, 0, 1]])).Errors[0].Pointer);
        Assert.Equal("/transform/partition/2", Assert.Throws<CompositionException>(() => SequentialBinaryPartition.ToBasis(Parts, [[1, 1, -1, -1], [1, -1, 0, 0], [0, 0, 1, 1]])).Errors[0].Pointer);
    }
}
