using System.Globalization;
using Partwise.Core.Problems;

namespace Partwise.Core.Transforms;

/// <summary>Validation of coordinate tables handed to an inverse transform.</summary>
public static class CoordinateInput
{
    /// <summary>
    /// Checks that <paramref name="values"/> holds at least one full row of <paramref name="width"/> finite
    /// numbers; pointers are <c>/rows/i/k</c>.
    /// </summary>
    /// <exception cref="CompositionException">An empty or ragged table, or a non-finite value.</exception>
    public static void Require(double[] values, int width)
    {
        ArgumentNullException.ThrowIfNull(values);
        if (values.Length == 0 || values.Length % width != 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/rows", string.Create(CultureInfo.InvariantCulture, $"Each row of coordinates needs {width} values."));
        }

        for (var k = 0; k < values.Length; k++)
        {
            if (!double.IsFinite(values[k]))
            {
                throw new CompositionException(ProblemTypes.NonFiniteValue, $"/rows/{k / width}/{k % width}", "The coordinate is not a finite number.");
            }
        }
    }

    /// <summary>Flattens jagged rows, checking each has <paramref name="width"/> values (pointer <c>/rows/i</c>).</summary>
    /// <exception cref="CompositionException">A row of the wrong length.</exception>
    public static double[] Flatten(IReadOnlyList<double[]> rows, int width)
    {
        ArgumentNullException.ThrowIfNull(rows);
        if (rows.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/rows", "At least one row of coordinates is needed.");
        }

        var values = new double[rows.Count * width];
        for (var i = 0; i < rows.Count; i++)
        {
            if (rows[i] is null || rows[i].Length != width)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, $"/rows/{i}", string.Create(CultureInfo.InvariantCulture, $"Row {i} has {rows[i]?.Length ?? 0} coordinates; this transform has {width}."));
            }

            rows[i].CopyTo(values, i * width);
        }

        return values;
    }
}
