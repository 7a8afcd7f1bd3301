using System.Text.Json;
using Partwise.Core.Analysis;
using Partwise.Core.Problems;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Selection;
using Partwise.Core.Tests.Support;
using Partwise.Core.Variance;

namespace Partwise.Core.Tests.Analysis;

public class LogRatioAnalysisTests
{
    private static readonly CompositionTable Water = SeededAmalgamations.Groundwater(21, 90);

    // METHODS.md "Log-ratio analysis": the inertia S² sums to TV = Σ_j w_j var(clr_j) (divisor n), so the fractions sum to 1;
    // contributions V² sum to 1 per dimension; the row principal coordinates have weighted variance s_k² on dimension k.
    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void InertiaSumsToTheTotalVarianceAndCoordinatesHaveTheirScales(bool mean)
    {
        var result = LogRatioAnalysis.Run(Water, mean ? PartWeightSpec.Mean : PartWeightSpec.Equal, 3);
        var w = PartWeights.Resolve(mean ? PartWeightSpec.Mean : PartWeightSpec.Equal, Water);

        var tv = 0.0;
        for (var j = 0; j < 8; j++)
        {
            var clr = Enumerable.Range(0, 90).Select(i =>
            {
                var row = Water.Row(i);
                var g = 0.0;
                for (var k = 0; k < 8; k++)
                {
                    g += w[k] * Math.Log(row[k]);
                }

                return Math.Log(row[j]) - g;
            }).ToArray();
            var m = clr.Average();
            tv += w[j] * clr.Sum(v => (v - m) * (v - m)) / 90;
        }

        Tolerance.Close(tv, result.TotalVariance, 1e-14, 1e-11, "TV");
        Tolerance.Close(tv, result.SingularValues.Sum(s => s * s), 1e-14, 1e-11, "Σ s²");
        Tolerance.Close(1.0, result.Inertia.Sum(), 1e-12, 0, "Σ inertia");
        Assert.Equal(7, result.SingularValues.Count);
        Assert.Equal("n", result.Divisor);
        for (var k = 0; k < 3; k++)
        {
            Tolerance.Close(1.0, result.Contributions.Sum(c => c[k]), 1e-12, 0, $"contributions of dimension {k}");
            Tolerance.Close(result.SingularValues[k] * result.SingularValues[k], result.RowPrincipal.Sum(r => r[k] * r[k]) / 90, 1e-14, 1e-10, $"row variance on {k}");
            // Part standard coordinates are weighted-orthonormal: Σ_j w_j f_jk² = 1.
            Tolerance.Close(1.0, Enumerable.Range(0, 8).Sum(j => w[j] * result.PartStandard[j][k] * result.PartStandard[j][k]), 1e-12, 0, $"standard norm {k}");
        }
    }

    [Fact]
    public void EachDimensionIsOrientedSoItsLargestPartLoadingIsPositive()
    {
        var result = LogRatioAnalysis.Run(Water, PartWeightSpec.Equal, 4);
        for (var k = 0; k < 4; k++)
        {
            var lead = Enumerable.Range(0, 8).MaxBy(j => result.Contributions[j][k]);
            Assert.True(result.PartStandard[lead][k] > 0);
        }
    }

    // Reference: numpy.linalg.svd of the same Z (tests/reference/lra_reference.py); singular vectors agree up to sign.
    [NeedsPythonFact]
    public void SingularValuesAndCoordinatesAgreeWithNumpyUpToSign()
    {
        foreach (var (table, spec) in new[] { (Water, PartWeightSpec.Equal), (Water, PartWeightSpec.Mean), (SeededCompositions.Table(22, 5, 9), PartWeightSpec.Equal) })
        {
            var d = Math.Min(3, Math.Min(table.PartCount, table.RowCount) - 1);
            var result = LogRatioAnalysis.Run(table, spec, d);
            var reference = PythonReference.Run(
                ReferenceFiles.Read("lra_reference.py"),
                new { values = SelectionReferenceTests.Rows(table), weights = PartWeights.Resolve(spec, table), dimensions = d });

            var scale = result.SingularValues[0];
            Tolerance.Close(reference.GetProperty("singularValues").Deserialize<double[]>()!, result.SingularValues.ToArray(), 1e-12 * scale, 0, "singular values");
            Tolerance.Close(reference.GetProperty("totalVariance").GetDouble(), result.TotalVariance, 1e-14, 1e-11, "TV");
            var principal = reference.GetProperty("principal").Deserialize<double[][]>()!;
            var standard = reference.GetProperty("standard").Deserialize<double[][]>()!;
            for (var k = 0; k < d; k++)
            {
                var sign = Math.Sign(Enumerable.Range(0, table.PartCount).Sum(j => standard[j][k] * result.PartStandard[j][k]));
                Tolerance.Close([.. standard.Select(r => sign * r[k])], result.PartStandard.Select(r => r[k]).ToArray(), 1e-9, 0, $"standard {k}");
                Tolerance.Close([.. principal.Select(r => sign * r[k])], result.RowPrincipal.Select(r => r[k]).ToArray(), 1e-9 * scale, 0, $"principal {k}");
            }
        }
    }

    [Fact]
    public void FewerRowsThanPartsGiveNMinusOneDimensions()
    {
        var result = LogRatioAnalysis.Run(SeededCompositions.Table(23, 4, 10), PartWeightSpec.Equal, 3);
        Assert.Equal(3, result.SingularValues.Count);
        Tolerance.Close(1.0, result.Inertia.Sum(), 1e-12, 0, "Σ inertia");
    }

    [Theory]
    [InlineData(0)]
    [InlineData(8)]
    public void DimensionsOutsideOneToJMinusOneAreAnInvalidOption(int dimensions)
    {
        var ex = Assert.Throws<CompositionException>(() => LogRatioAnalysis.Run(Water, PartWeightSpec.Equal, dimensions));
        Assert.Equal(ProblemTypes.InvalidOption, ex.ProblemType);
        Assert.Equal("/dimensions", ex.Errors[0].Pointer);
    }

    [Fact]
    public void AZeroCellIsAZeroValueAndProportionalRowsHaveNoVariation()
    {
        var values = (double[])Water.Values.Clone();
        values[5] = 0;
        var zero = Assert.Throws<CompositionException>(() => LogRatioAnalysis.Run(CompositionTable.FromValues(Water.Parts, values), PartWeightSpec.Equal));
        Assert.Equal(ProblemTypes.ZeroValue, zero.ProblemType);
        Assert.Equal("/rows/0/5", zero.Errors[0].Pointer);

        var proportional = new double[6 * 8];
        for (var i = 0; i < 6; i++)
        {
            for (var j = 0; j < 8; j++)
            {
                proportional[(i * 8) + j] = (i + 2) * Water.Row(0)[j];
            }
        }

        var flat = Assert.Throws<CompositionException>(() => LogRatioAnalysis.Run(CompositionTable.FromValues(Water.Parts, proportional), PartWeightSpec.Equal));
        Assert.Equal(ProblemTypes.NoVariation, flat.ProblemType);
    }
}
