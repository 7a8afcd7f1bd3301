using MathNet.Numerics.LinearAlgebra;
using Partwise.Core.Selection;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Selection;

public class SymmetricEigenvaluesTests
{
    // Reference: MathNet's symmetric eigenvalue decomposition (a general-purpose library) on seeded matrices, including
    // positive semi-definite ones of low rank as the Procrustes correlation produces.
    [Theory]
    [InlineData(1, 1, 1)]
    [InlineData(2, 2, 2)]
    [InlineData(3, 5, 5)]
    [InlineData(4, 17, 17)]
    [InlineData(5, 40, 12)]
    [InlineData(6, 99, 60)]
    public void EigenvaluesAgreeWithAFullDecomposition(int seed, int order, int rank)
    {
        var random = new Random(seed);
        var g = Matrix<double>.Build.Dense(order, rank, (_, _) => SeededCompositions.Gaussian(random));
        var a = g * g.Transpose();
        if (seed % 2 == 0)
        {
            a -= Matrix<double>.Build.DenseIdentity(order) * 0.5; // indefinite too
        }

        var expected = a.Evd(Symmetricity.Symmetric).EigenValues.Select(e => e.Real).Order().ToArray();
        var buffer = a.ToRowMajorArray();
        var eigen = new double[order];
        SymmetricEigenvalues.Compute(buffer, order, eigen, new double[3 * order]);
        var scale = expected.Max(Math.Abs);

        Tolerance.Close(expected, eigen.Order().ToArray(), 1e-12 * scale, 0, "eigenvalue");
    }

    [Fact]
    public void RepeatedAndZeroEigenvaluesConverge()
    {
        // diag(2, 2, 2, 0, 0) rotated: exact multiplicities stress deflation.
        var random = new Random(7);
        var q = Matrix<double>.Build.Dense(5, 5, (_, _) => SeededCompositions.Gaussian(random)).QR().Q;
        var a = q * Matrix<double>.Build.DenseOfDiagonalArray([2, 2, 2, 0, 0]) * q.Transpose();
        var eigen = new double[5];
        SymmetricEigenvalues.Compute(a.ToRowMajorArray(), 5, eigen, new double[15]);
        Tolerance.Close([0, 0, 2, 2, 2], eigen.Order().ToArray(), 1e-14, 0, "eigenvalue");
    }
}
