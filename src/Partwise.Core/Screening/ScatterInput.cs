using Partwise.Core.Problems;

namespace Partwise.Core.Screening;

/// <summary>Checks shared by the scatter estimators: shape, finiteness and the minimum number of rows.</summary>
internal static class ScatterInput
{
    /// <summary>Returns n for a row-major n × p matrix, or throws.</summary>
    /// <exception cref="ArgumentException">A shape that is not n × p, or a value that is not finite.</exception>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.TooFewSamples"/> when n &lt; p + 1.</exception>
    internal static int RowCount(ReadOnlySpan<double> coordinates, int dimension, string pointer)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(dimension, 1);
        ArgumentNullException.ThrowIfNull(pointer);
        if (coordinates.Length % dimension != 0)
        {
            throw new ArgumentException($"The coordinates hold {coordinates.Length} values, not a whole number of rows of {dimension}.", nameof(coordinates));
        }

        foreach (var v in coordinates)
        {
            if (!double.IsFinite(v))
            {
                throw new ArgumentException("Every coordinate must be finite.", nameof(coordinates));
            }
        }

        var n = coordinates.Length / dimension;
        if (n < dimension + 1)
        {
            throw new CompositionException(
                ProblemTypes.TooFewSamples,
                pointer,
                $"{n} reference sample(s) cannot define a scatter in {dimension} coordinates; at least {dimension + 1} are needed.");
        }

        return n;
    }

    internal static CompositionException Singular(string pointer, string detail) =>
        new(ProblemTypes.SingularScatter, pointer, detail);
}
