namespace Partwise.Core.Screening;

/// <summary>The classical location and scatter: the mean and the sample covariance.</summary>
public static class ClassicalScatter
{
    /// <summary>
    /// μ = (1/n) Σ yᵢ and Σ = (1/(n − 1)) Σ (yᵢ − μ)(yᵢ − μ)ᵀ over the rows of a row-major n × p coordinate matrix.
    /// </summary>
    /// <param name="coordinates">n × p finite values, row-major (not modified).</param>
    /// <param name="dimension">p ≥ 1.</param>
    /// <param name="pointer">JSON pointer of the reference rows in the request, for problems.</param>
    /// <returns>The estimate; every row is used.</returns>
    /// <exception cref="ArgumentException">A shape that is not n × p or a non-finite value.</exception>
    /// <exception cref="Problems.CompositionException">
    /// <see cref="Problems.ProblemTypes.TooFewSamples"/> when n &lt; p + 1; <see cref="Problems.ProblemTypes.SingularScatter"/>
    /// when Σ is singular (a constant coordinate, or coordinates that are linear combinations of each other).
    /// </exception>
    public static ScatterEstimate Fit(double[] coordinates, int dimension, string pointer = "/rows")
    {
        ArgumentNullException.ThrowIfNull(coordinates);
        var n = ScatterInput.RowCount(coordinates, dimension, pointer);
        var p = dimension;
        var rows = Enumerable.Range(0, n).ToArray();
        var mean = new double[p];
        var covariance = new double[p * p];
        SubsetMoments.Compute(coordinates, p, rows, n - 1, mean, covariance, new double[2 * p]);
        if (!CholeskyKernel.TryFactor(covariance, p, new double[p * p], out _))
        {
            throw ScatterInput.Singular(pointer, "The covariance of the reference coordinates is singular: a coordinate is constant, or depends linearly on the others.");
        }

        var used = new bool[n];
        Array.Fill(used, true);
        return new ScatterEstimate(ScatterMethod.Classical, p, mean, covariance, used, robust: null);
    }
}
