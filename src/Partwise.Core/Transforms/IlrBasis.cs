namespace Partwise.Core.Transforms;

/// <summary>
/// An orthonormal basis V (J × (J − 1)) of the clr plane: V'V = I and V'1 = 0, so that ilr(x) = V' ln x
/// (Egozcue, Pawlowsky-Glahn, Mateu-Figueras &amp; Barceló-Vidal 2003, Math. Geol. 35:279-300).
/// </summary>
public sealed class IlrBasis
{
    /// <summary>Wraps a basis; the caller guarantees orthonormality (the factories do).</summary>
    /// <param name="parts">The J part names.</param>
    /// <param name="coefficients">V, row-major J × (J − 1): V[j, i] at <c>j * (J − 1) + i</c>.</param>
    /// <param name="labels">One balance label per coordinate.</param>
    internal IlrBasis(IReadOnlyList<string> parts, double[] coefficients, IReadOnlyList<string> labels)
    {
        Parts = parts;
        Coefficients = coefficients;
        Labels = labels;
    }

    /// <summary>The J part names, in table order.</summary>
    public IReadOnlyList<string> Parts { get; }

    /// <summary>V, row-major J × (J − 1).</summary>
    public double[] Coefficients { get; }

    /// <summary>One label per coordinate, e.g. <c>g(Ca)/g(Mg,Na,K)</c>.</summary>
    public IReadOnlyList<string> Labels { get; }

    /// <summary>J.</summary>
    public int PartCount => Parts.Count;

    /// <summary>J − 1.</summary>
    public int Dimension => Parts.Count - 1;

    /// <summary>V[j, i].</summary>
    public double this[int part, int coordinate] => Coefficients[(part * Dimension) + coordinate];

    /// <summary>V as jagged rows (J rows of J − 1), for responses.</summary>
    public double[][] ToRows()
    {
        var rows = new double[PartCount][];
        for (var j = 0; j < PartCount; j++)
        {
            rows[j] = Coefficients.AsSpan(j * Dimension, Dimension).ToArray();
        }

        return rows;
    }

    /// <summary>The balance label g(A)/g(B) of a coordinate with numerator parts A and denominator parts B.</summary>
    internal static string BalanceLabel(IReadOnlyList<string> parts, IEnumerable<int> plus, IEnumerable<int> minus) =>
        $"g({string.Join(',', plus.Select(k => parts[k]))})/g({string.Join(',', minus.Select(k => parts[k]))})";
}
