using Partwise.Core.Problems;
using Partwise.Core.Tables;

namespace Partwise.Core.Variance;

/// <summary>How part weights w are chosen: equal, mean closed proportions, or given per part.</summary>
public sealed record PartWeightSpec
{
    private PartWeightSpec(string mode, IReadOnlyDictionary<string, double>? map)
    {
        Mode = mode;
        Map = map;
    }

    /// <summary>w_j = 1/J, the unweighted analysis.</summary>
    public static PartWeightSpec Equal { get; } = new("equal", null);

    /// <summary>w_j = mean closed proportion of part j (Greenacre &amp; Lewi 2009, J. Classification 26:29-54).</summary>
    public static PartWeightSpec Mean { get; } = new("mean", null);

    /// <summary>Weights given per part, normalised to sum 1. Every part must be named with a positive number.</summary>
    public static PartWeightSpec Given(IReadOnlyDictionary<string, double> map) =>
        new("given", map ?? throw new ArgumentNullException(nameof(map)));

    /// <summary><c>equal</c>, <c>mean</c> or <c>given</c>.</summary>
    public string Mode { get; }

    /// <summary>The given weights, for <c>given</c>.</summary>
    public IReadOnlyDictionary<string, double>? Map { get; }
}

/// <summary>Resolves a <see cref="PartWeightSpec"/> to a weight vector w (length J, w_j &gt; 0, Σ w = 1).</summary>
public static class PartWeights
{
    /// <summary>
    /// Resolves the weights for a strictly positive table (zeros already handled).
    /// </summary>
    /// <param name="spec">The weights asked for.</param>
    /// <param name="table">The table; used for part names and, for <c>mean</c>, its closed rows.</param>
    /// <param name="pointer">JSON pointer of the weights option in the request, usually <c>/weights</c>.</param>
    /// <exception cref="CompositionException">Unknown parts, missing parts, or non-positive weights.</exception>
    public static double[] Resolve(PartWeightSpec spec, CompositionTable table, string pointer = "/weights")
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(table);
        var j = table.PartCount;
        var w = new double[j];
        switch (spec.Mode)
        {
            case "equal":
                Array.Fill(w, 1.0 / j);
                return w;
            case "mean":
                var closed = new double[j];
                for (var i = 0; i < table.RowCount; i++)
                {
                    table.Row(i).CopyTo(closed);
                    if (Closure.CloseRow(closed, 1.0))
                    {
                        for (var k = 0; k < j; k++)
                        {
                            w[k] += closed[k];
                        }
                    }
                }

                break;
            default:
                foreach (var (name, value) in spec.Map!)
                {
                    var k = table.IndexOf(name);
                    if (k < 0)
                    {
                        throw new CompositionException(ProblemTypes.UnknownPart, $"{pointer}/{JsonPointer.Escape(name)}", $"The table has no part named '{name}'.");
                    }

                    if (!double.IsFinite(value) || value <= 0)
                    {
                        throw new CompositionException(ProblemTypes.InvalidWeights, $"{pointer}/{JsonPointer.Escape(name)}", "A part weight must be a positive finite number.");
                    }

                    w[k] = value;
                }

                for (var k = 0; k < j; k++)
                {
                    if (w[k] == 0)
                    {
                        throw new CompositionException(ProblemTypes.InvalidWeights, pointer, $"The weights give no value for part '{table.Parts[k]}'; give every part a weight.");
                    }
                }

                break;
        }

        var total = w.Sum();
        for (var k = 0; k < j; k++)
        {
            w[k] /= total;
        }

        return w;
    }
}
