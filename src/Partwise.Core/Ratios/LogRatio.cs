using System.Globalization;
using Partwise.Core.Problems;

namespace Partwise.Core.Ratios;

/// <summary>How a log-ratio combines the parts on each of its sides.</summary>
public enum RatioKind
{
    /// <summary>ln(x_a / x_b): one part on each side.</summary>
    Pairwise,

    /// <summary>ln(Σ_A x / Σ_B x): sums (amalgamations) of disjoint part sets.</summary>
    Amalgamation,

    /// <summary>√(r s / (r + s)) ln(g(A) / g(B)): the isometric balance of geometric means (Egozcue &amp; Pawlowsky-Glahn 2005).</summary>
    Balance,
}

/// <summary>
/// One log-ratio between two disjoint, non-empty sets of parts, given by part indices into a table.
/// </summary>
/// <remarks>
/// Pairwise: ln(x_a / x_b). Amalgamation: ln(Σ_{j∈A} x_j / Σ_{j∈B} x_j), the log-ratio of amalgamations
/// (Aitchison 1986, ch. 5). Balance: √(r s / (r + s)) ln(g(x_A) / g(x_B)) with g the geometric mean, r = |A|,
/// s = |B| (Egozcue &amp; Pawlowsky-Glahn 2005, Math. Geol. 37:795-828). A one-part-per-side ratio is always
/// normalised to <see cref="RatioKind.Pairwise"/>, whatever kind was asked, since all three formulas agree there
/// except the balance's factor √(1/2); a one-part balance keeps <see cref="RatioKind.Balance"/> if asked for.
/// </remarks>
public sealed class LogRatio
{
    private LogRatio(int[] numerator, int[] denominator, RatioKind kind, string label)
    {
        Numerator = numerator;
        Denominator = denominator;
        Kind = kind;
        Label = label;
    }

    /// <summary>Part indices of the numerator, in the order given.</summary>
    public IReadOnlyList<int> Numerator { get; }

    /// <summary>Part indices of the denominator, in the order given.</summary>
    public IReadOnlyList<int> Denominator { get; }

    /// <summary>How the sides are combined.</summary>
    public RatioKind Kind { get; }

    /// <summary>The label callers see: <c>Na/Cl</c>, <c>(Ca+Mg)/(Na+K)</c>, <c>hardness/alkalis</c>, <c>g(Ca,Mg)/g(Na,K)</c>.</summary>
    public string Label { get; }

    /// <summary>
    /// Builds a validated log-ratio from part names.
    /// </summary>
    /// <param name="parts">The table's part names, in order.</param>
    /// <param name="numerator">Names of the numerator parts (non-empty).</param>
    /// <param name="denominator">Names of the denominator parts (non-empty, disjoint from the numerator).</param>
    /// <param name="kind">Required when a side has more than one part; optional (pairwise) otherwise.</param>
    /// <param name="pointer">JSON pointer of this ratio in the request, e.g. <c>/transform/ratios/2</c>.</param>
    /// <param name="numeratorName">Optional name of a named amalgamation used for the label.</param>
    /// <param name="denominatorName">Optional name of a named amalgamation used for the label.</param>
    /// <exception cref="CompositionException">Unknown parts, overlapping or empty sides, a missing kind.</exception>
    public static LogRatio Create(
        IReadOnlyList<string> parts,
        IReadOnlyList<string> numerator,
        IReadOnlyList<string> denominator,
        RatioKind? kind,
        string pointer,
        string? numeratorName = null,
        string? denominatorName = null)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(pointer);
        var num = Resolve(parts, numerator, pointer + "/num");
        var den = Resolve(parts, denominator, pointer + "/den");
        return FromIndices(parts, num, den, kind, pointer, numeratorName, denominatorName);
    }

    /// <summary>Builds a validated log-ratio from part indices (see <see cref="Create"/>).</summary>
    /// <exception cref="CompositionException">Overlapping or empty sides, a missing kind.</exception>
    public static LogRatio FromIndices(
        IReadOnlyList<string> parts,
        int[] numerator,
        int[] denominator,
        RatioKind? kind,
        string pointer,
        string? numeratorName = null,
        string? denominatorName = null)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(numerator);
        ArgumentNullException.ThrowIfNull(denominator);
        if (numerator.Length == 0 || denominator.Length == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidRatio, numerator.Length == 0 ? pointer + "/num" : pointer + "/den", "Each side of a ratio needs at least one part.");
        }

        for (var a = 0; a < numerator.Length; a++)
        {
            if (Array.IndexOf(numerator, numerator[a], a + 1) >= 0)
            {
                throw new CompositionException(ProblemTypes.InvalidRatio, $"{pointer}/num", $"The part '{parts[numerator[a]]}' appears twice in the numerator.");
            }

            if (Array.IndexOf(denominator, numerator[a]) >= 0)
            {
                throw new CompositionException(ProblemTypes.InvalidRatio, pointer, $"The part '{parts[numerator[a]]}' is in both the numerator and the denominator.");
            }
        }

        for (var b = 0; b < denominator.Length; b++)
        {
            if (Array.IndexOf(denominator, denominator[b], b + 1) >= 0)
            {
                throw new CompositionException(ProblemTypes.InvalidRatio, $"{pointer}/den", $"The part '{parts[denominator[b]]}' appears twice in the denominator.");
            }
        }

        var single = numerator.Length == 1 && denominator.Length == 1;
        RatioKind resolved;
        if (single)
        {
            resolved = kind == RatioKind.Balance ? RatioKind.Balance : RatioKind.Pairwise;
        }
        else if (kind is null || kind == RatioKind.Pairwise)
        {
            throw new CompositionException(
                ProblemTypes.InvalidRatio,
                pointer + "/kind",
                "A ratio with more than one part on a side needs \"kind\": \"amalgamation\" or \"balance\".");
        }
        else
        {
            resolved = kind.Value;
        }

        return new LogRatio(numerator, denominator, resolved, MakeLabel(parts, numerator, denominator, resolved, numeratorName, denominatorName));
    }

    /// <summary>
    /// The value of the log-ratio for one composition row (natural log). The row must be strictly positive on the
    /// ratio's parts; zero handling comes first.
    /// </summary>
    public double Evaluate(ReadOnlySpan<double> row)
    {
        switch (Kind)
        {
            case RatioKind.Pairwise:
                return LogOfQuotient(row[Numerator[0]], row[Denominator[0]]);
            case RatioKind.Amalgamation:
                {
                    double a = 0, b = 0;
                    foreach (var j in Numerator)
                    {
                        a += row[j];
                    }

                    foreach (var j in Denominator)
                    {
                        b += row[j];
                    }

                    return LogOfQuotient(a, b);
                }

            default:
                {
                    double la = 0, lb = 0;
                    foreach (var j in Numerator)
                    {
                        la += Math.Log(row[j]);
                    }

                    foreach (var j in Denominator)
                    {
                        lb += Math.Log(row[j]);
                    }

                    double r = Numerator.Count, s = Denominator.Count;
                    return Math.Sqrt(r * s / (r + s)) * ((la / r) - (lb / s));
                }
        }
    }

    /// <summary>
    /// ln(a / b) for a, b &gt; 0. The quotient of two finite doubles can overflow to infinity or underflow to zero
    /// (44.9 / 1e-320 is past 1.8e308) although ln a − ln b is an ordinary number (about 741), so the difference of
    /// logs is taken whenever the quotient is not a normal double; otherwise the one log of the quotient, as before.
    /// </summary>
    private static double LogOfQuotient(double a, double b)
    {
        var q = a / b;
        return double.IsNormal(q) ? Math.Log(q) : Math.Log(a) - Math.Log(b);
    }

    /// <summary>
    /// The log-contrast coefficients a (length J) with value a' ln x, for pairwise and balance ratios;
    /// null for amalgamations, which are not linear in ln x.
    /// </summary>
    public double[]? LogContrast(int partCount)
    {
        if (Kind == RatioKind.Amalgamation)
        {
            return null;
        }

        var a = new double[partCount];
        if (Kind == RatioKind.Pairwise)
        {
            a[Numerator[0]] = 1;
            a[Denominator[0]] = -1;
            return a;
        }

        double r = Numerator.Count, s = Denominator.Count;
        var plus = Math.Sqrt(s / (r * (r + s)));
        var minus = Math.Sqrt(r / (s * (r + s)));
        foreach (var j in Numerator)
        {
            a[j] = plus;
        }

        foreach (var j in Denominator)
        {
            a[j] = -minus;
        }

        return a;
    }

    private static int[] Resolve(IReadOnlyList<string> parts, IReadOnlyList<string> names, string pointer)
    {
        if (names is null || names.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidRatio, pointer, "Each side of a ratio needs at least one part.");
        }

        var result = new int[names.Count];
        for (var i = 0; i < names.Count; i++)
        {
            var index = -1;
            for (var j = 0; j < parts.Count; j++)
            {
                if (string.Equals(parts[j], names[i], StringComparison.Ordinal))
                {
                    index = j;
                    break;
                }
            }

            result[i] = index >= 0
                ? index
                : throw new CompositionException(ProblemTypes.UnknownPart, $"{pointer}/{i}", $"The table has no part named '{names[i]}'.");
        }

        return result;
    }

    private static string MakeLabel(IReadOnlyList<string> parts, int[] num, int[] den, RatioKind kind, string? numName, string? denName)
    {
        string Side(int[] side, string? name) =>
            name ?? (side.Length == 1 ? parts[side[0]] : "(" + string.Join('+', side.Select(j => parts[j])) + ")");

        return kind switch
        {
            RatioKind.Balance => string.Create(CultureInfo.InvariantCulture, $"g({string.Join(',', num.Select(j => parts[j]))})/g({string.Join(',', den.Select(j => parts[j]))})"),
            _ => Side(num, numName) + "/" + Side(den, denName),
        };
    }
}
