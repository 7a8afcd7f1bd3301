using FsCheck;
using FsCheck.Xunit;
using Partwise.Core.Tables;
using Partwise.Core.Tests.Support;
using Partwise.Core.Transforms;
using Partwise.Core.Variance;
using Partwise.Core.Zeros;

namespace Partwise.Core.Tests.Properties;

/// <summary>
/// Identities of the log-ratio geometry (Aitchison 1986; Egozcue et al. 2003), checked on seeded tables whose
/// seed and size FsCheck draws: J from 2 to 25, n from 1 to 40.
/// </summary>
public class TransformProperties
{
    private static CompositionTable Draw(PositiveInt seed, byte size, out Random random)
    {
        random = new Random(seed.Get);
        var parts = 2 + (size % 24);
        var rows = 1 + (size * 7 % 40);
        return SeededCompositions.Table(seed.Get, rows, parts, sigma: 0.3 + (2 * random.NextDouble()));
    }

    [Property(MaxTest = 200)]
    public void InverseAfterForwardGivesTheClosedTable(PositiveInt seed, byte size)
    {
        var table = Draw(seed, size, out var random);
        var closed = Closure.Close(table).Values;
        var basis = PivotBasis.Create(table.Parts);
        var partition = SequentialBinaryPartition.ToBasis(table.Parts, RandomPartitions.Draw(table.PartCount, random));
        var denominator = random.Next(table.PartCount);

        Tolerance.Close(closed, Clr.Inverse(table.Parts, Clr.Forward(table).Values).Values, 1e-14, 1e-10, "clr");
        Tolerance.Close(closed, Alr.Inverse(table.Parts, denominator, Alr.Forward(table, denominator).Values).Values, 1e-14, 1e-10, "alr");
        Tolerance.Close(closed, Ilr.Inverse(basis, Ilr.Forward(table, basis).Values).Values, 1e-14, 1e-10, "ilr pivot");
        Tolerance.Close(closed, Ilr.Inverse(partition, Ilr.Forward(table, partition).Values).Values, 1e-14, 1e-10, "ilr partition");
    }

    [Property(MaxTest = 200)]
    public void ClrRowsSumToZero(PositiveInt seed, byte size)
    {
        var table = Draw(seed, size, out _);
        var clr = Clr.Forward(table);
        for (var i = 0; i < clr.RowCount; i++)
        {
            var sum = 0.0;
            foreach (var v in clr.Row(i))
            {
                sum += v;
            }

            Tolerance.Close(0, sum, 1e-12, 0, "row sum");
        }
    }

    [Property(MaxTest = 100)]
    public void IlrIsAnIsometryForTheAitchisonDistance(PositiveInt seed, byte size)
    {
        // d_A(x, y) = ‖ilr(x) − ilr(y)‖ for any orthonormal basis (Egozcue et al. 2003, Property 1).
        var table = Draw(seed, size, out var random);
        var distances = AitchisonDistance.Matrix(table);
        foreach (var basis in new[] { PivotBasis.Create(table.Parts), SequentialBinaryPartition.ToBasis(table.Parts, RandomPartitions.Draw(table.PartCount, random)) })
        {
            var z = Ilr.Forward(table, basis);
            for (var a = 0; a < table.RowCount; a++)
            {
                for (var b = 0; b < table.RowCount; b++)
                {
                    var s = 0.0;
                    for (var c = 0; c < z.ColumnCount; c++)
                    {
                        var diff = z.Row(a)[c] - z.Row(b)[c];
                        s += diff * diff;
                    }

                    Tolerance.Close(distances[(a * table.RowCount) + b], Math.Sqrt(s), 1e-12, 1e-10, "distance");
                }
            }
        }
    }

    [Property(MaxTest = 100)]
    public void LogRatiosDoNotDependOnTheScaleOfARow(PositiveInt seed, byte size)
    {
        // Scale invariance (Aitchison 1986, §2.8): x and λx carry the same relative information.
        var table = Draw(seed, size, out var random);
        var scaled = (double[])table.Values.Clone();
        for (var i = 0; i < table.RowCount; i++)
        {
            var lambda = Math.Exp((random.NextDouble() * 20) - 10);
            for (var k = 0; k < table.PartCount; k++)
            {
                scaled[(i * table.PartCount) + k] *= lambda;
            }
        }

        var other = CompositionTable.FromValues(table.Parts, scaled);
        var basis = PivotBasis.Create(table.Parts);
        Tolerance.Close(Clr.Forward(table).Values, Clr.Forward(other).Values, 1e-11, 1e-11, "clr");
        Tolerance.Close(Ilr.Forward(table, basis).Values, Ilr.Forward(other, basis).Values, 1e-11, 1e-11, "ilr");
        Tolerance.Close(PairwiseLogRatios.Forward(table).Values, PairwiseLogRatios.Forward(other).Values, 1e-11, 1e-11, "pairwise");
    }

    [Property(MaxTest = 200)]
    public void MultiplicativeReplacementKeepsRatiosAmongNonZeroParts(PositiveInt seed, byte size)
    {
        // Martín-Fernández et al. 2003, Property 1: x_k / x_l is unchanged for non-zero k, l.
        var table = Draw(seed, size, out var random);
        var values = (double[])table.Values.Clone();
        var j = table.PartCount;
        for (var k = 0; k < values.Length; k++)
        {
            if (random.NextDouble() < 0.2 && (k % j) != 0)
            {
                values[k] = 0;
            }
        }

        var withZeros = CompositionTable.FromValues(table.Parts, values);
        var limit = values.Where(v => v > 0).Min() / 10;
        var result = ZeroReplacement.Apply(withZeros, new MultiplicativeReplacement(limit, null));
        for (var i = 0; i < withZeros.RowCount; i++)
        {
            var before = withZeros.Row(i);
            var after = result.Table.Row(i);
            Tolerance.Close(before.ToArray().Sum(), after.ToArray().Sum(), 1e-12, 1e-12, "row sum");
            for (var k = 0; k < j; k++)
            {
                if (before[k] > 0)
                {
                    Tolerance.Close(before[k] / before[0], after[k] / after[0], 1e-14, 1e-12, "ratio");
                }
            }
        }

        Assert.Equal(values.Count(v => v == 0), result.Imputed.Count);
    }

    [Property(MaxTest = 200)]
    public void PivotAndPartitionBasesAreOrthonormalAndOrthogonalToOnes(PositiveInt seed, byte size)
    {
        // V'V = I and V'1 = 0 (Egozcue et al. 2003, §3; Egozcue & Pawlowsky-Glahn 2005).
        var random = new Random(seed.Get);
        var j = 2 + (size % 40);
        var parts = Enumerable.Range(0, j).Select(k => $"p{k}").ToArray();
        foreach (var basis in new[] { PivotBasis.Create(parts), SequentialBinaryPartition.ToBasis(parts, RandomPartitions.Draw(j, random)) })
        {
            for (var a = 0; a < j - 1; a++)
            {
                var ones = 0.0;
                for (var k = 0; k < j; k++)
                {
                    ones += basis[k, a];
                }

                Tolerance.Close(0, ones, 1e-13, 0, "V'1");
                for (var b = 0; b < j - 1; b++)
                {
                    var dot = 0.0;
                    for (var k = 0; k < j; k++)
                    {
                        dot += basis[k, a] * basis[k, b];
                    }

                    Tolerance.Close(a == b ? 1 : 0, dot, 1e-13, 0, "V'V");
                }
            }
        }
    }
}
