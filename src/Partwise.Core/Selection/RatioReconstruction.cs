using System.Globalization;
using MathNet.Numerics.LinearAlgebra;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Tables;

namespace Partwise.Core.Selection;

/// <summary>
/// Back-transform from ratio values to compositions (Greenacre 2020, Applied Computing and Geosciences 5:100017), and the
/// structural test of whether a ratio set determines a composition at all.
/// </summary>
public static class RatioReconstruction
{
    /// <summary>Above this condition number (1-norm for the system in x, 2-norm for the one in ln x) a set is refused.</summary>
    public const double MaxConditionNumber = 1e12;

    /// <summary>
    /// Whether the ratios determine a composition of <paramref name="parts"/> up to its total: the Jacobian of the map
    /// ln x ↦ (ratio values) has rank J − 1 at a generic composition. For pairwise ratios that is "the ratios, as edges
    /// between parts, connect all J parts" (a spanning tree when there are J − 1 of them); for pairwise and balance ratios
    /// it is "their log-contrasts span the J − 1 dimensional space of log-contrasts"; for amalgamation ratios, whose
    /// equations Σ_A x − e^y Σ_B x = 0 are linear in x, the Jacobian rows are those equations' rows up to a factor, so it
    /// is the generic non-singularity of the system <see cref="Solve"/> solves.
    /// </summary>
    /// <param name="parts">The J ≥ 2 part names the ratios' indices refer to.</param>
    /// <param name="ratios">Any ratios over those parts (an empty set is not invertible).</param>
    /// <returns>True when the set is complete. Cost: O(k J) for pairwise sets, O(k J min(k, J)) otherwise.</returns>
    /// <remarks>The generic composition is fixed (x_j = exp(2 frac(0.5 + (j + 1) · 0.618…))), and the rank uses a relative
    /// singular-value tolerance of 1e-9; a set that is singular only at special ratio values is caught by <see cref="Solve"/>.</remarks>
    public static bool IsInvertible(IReadOnlyList<string> parts, IReadOnlyList<LogRatio> ratios)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(ratios);
        var j = parts.Count;
        CheckIndices(j, ratios);
        if (j < 2 || ratios.Count < j - 1)
        {
            return false;
        }

        if (ratios.All(r => r.Kind == RatioKind.Pairwise))
        {
            return Components(j, ratios).Distinct().Count() == 1;
        }

        return JacobianRank(j, ratios) == j - 1;
    }

    /// <summary>
    /// Reconstructs compositions from the values (natural logs) of a complete ratio set.
    /// </summary>
    /// <param name="parts">The J ≥ 2 part names.</param>
    /// <param name="ratios">Exactly J − 1 ratios over the parts, forming a complete set (<see cref="IsInvertible"/>).</param>
    /// <param name="rows">One row of J − 1 log values per composition, in the order of <paramref name="ratios"/>.</param>
    /// <param name="total">The closure total κ &gt; 0 (default 1).</param>
    /// <param name="cancellationToken">Looked at every row (a J × J solve each); once cancelled the call throws <see cref="OperationCanceledException"/>.</param>
    /// <returns>The compositions, each summing to <paramref name="total"/>.</returns>
    /// <remarks>
    /// <para>Pairwise and amalgamation ratios: each ratio with value y gives Σ_A x − e^y Σ_B x = 0 (scaled so that its largest
    /// coefficient is 1), and Σ x = κ completes a J × J system, solved by LU per row; its 1-norm condition number must not
    /// exceed 1e12 and every part of the solution must be positive.</para>
    /// <para>Sets of pairwise and balance ratios only are linear in ln x instead: a' ln x = y for each ratio's log-contrast a,
    /// with 1' ln x = 0, solved once by LU; then x = C(exp(ln x)), positive by construction. For pairwise sets this is the
    /// same solution as the system in x, computed without forming e^y.</para>
    /// <para>Balances together with amalgamation ratios are refused: the equations are then linear neither in x nor in ln x,
    /// and a solution need not be unique.</para>
    /// </remarks>
    /// <exception cref="CompositionException"><see cref="ProblemTypes.SingularRatioSet"/> at <c>/ratios</c> for a set that
    /// is not J − 1 ratios, incomplete or ill-conditioned (with <c>/rows/i</c> when only that row's values make it so);
    /// <see cref="ProblemTypes.UnsupportedRatioSet"/> at <c>/ratios/i</c> (the first balance) for balances with amalgamations;
    /// <see cref="ProblemTypes.InfeasibleRatioValues"/> at <c>/rows/i</c> when a part comes out ≤ 0;
    /// <see cref="ProblemTypes.NonFiniteValue"/> at <c>/rows/i/k</c>; <see cref="ProblemTypes.InvalidInput"/> for fewer than
    /// two parts (<c>/parts</c>), no rows or a row of the wrong length (<c>/rows/i</c>);
    /// <see cref="ProblemTypes.InvalidOption"/> for a total that is not positive (<c>/total</c>).</exception>
    public static CompositionTable Solve(IReadOnlyList<string> parts, IReadOnlyList<LogRatio> ratios, IReadOnlyList<double[]> rows, double total = 1, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(ratios);
        ArgumentNullException.ThrowIfNull(rows);
        var j = parts.Count;
        if (j < 2)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/parts", "A composition needs at least two parts.");
        }

        CheckIndices(j, ratios);
        if (!(double.IsFinite(total) && total > 0))
        {
            throw new CompositionException(ProblemTypes.InvalidOption, "/total", "The total must be a positive number.");
        }

        var firstBalance = IndexOfKind(ratios, RatioKind.Balance);
        var firstAmalgamation = IndexOfKind(ratios, RatioKind.Amalgamation);
        if (firstBalance >= 0 && firstAmalgamation >= 0)
        {
            throw new CompositionException(
                ProblemTypes.UnsupportedRatioSet,
                string.Create(CultureInfo.InvariantCulture, $"/ratios/{firstBalance}"),
                $"The balance {ratios[firstBalance].Label} cannot be back-transformed together with the amalgamation ratio {ratios[firstAmalgamation].Label}: their equations are linear neither in the parts nor in their logs. Use pairwise ratios with the amalgamations, or only pairwise ratios and balances.");
        }

        if (ratios.Count != j - 1)
        {
            throw new CompositionException(
                ProblemTypes.SingularRatioSet,
                "/ratios",
                string.Create(CultureInfo.InvariantCulture, $"A composition of {j} parts is determined by exactly {j - 1} ratios; {ratios.Count} were given."));
        }

        if (!IsInvertible(parts, ratios))
        {
            throw new CompositionException(ProblemTypes.SingularRatioSet, "/ratios", IncompleteDetail(parts, ratios));
        }

        CheckRows(rows, ratios.Count);
        var values = new double[rows.Count * j];
        if (firstAmalgamation < 0)
        {
            SolveInLogs(parts, ratios, rows, total, values, cancellationToken);
        }
        else
        {
            SolveInParts(parts, ratios, rows, total, values, cancellationToken);
        }

        return CompositionTable.FromValues(parts, values);
    }

    private static void SolveInLogs(IReadOnlyList<string> parts, IReadOnlyList<LogRatio> ratios, IReadOnlyList<double[]> rows, double total, double[] values, CancellationToken cancellationToken)
    {
        var j = parts.Count;
        var a = Matrix<double>.Build.Dense(j, j);
        for (var i = 0; i < ratios.Count; i++)
        {
            var contrast = ratios[i].LogContrast(j)!;
            for (var c = 0; c < j; c++)
            {
                a[i, c] = contrast[c];
            }
        }

        for (var c = 0; c < j; c++)
        {
            a[j - 1, c] = 1.0 / j;
        }

        var condition = a.ConditionNumber();
        if (!(condition <= MaxConditionNumber))
        {
            throw new CompositionException(
                ProblemTypes.SingularRatioSet,
                "/ratios",
                string.Create(CultureInfo.InvariantCulture, $"The ratio set is ill-conditioned (condition number {condition:G3} > {MaxConditionNumber:G1}): some parts are barely determined."));
        }

        var lu = a.LU();
        var y = Vector<double>.Build.Dense(j);
        var l = Vector<double>.Build.Dense(j);
        for (var r = 0; r < rows.Count; r++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            for (var i = 0; i < j - 1; i++)
            {
                y[i] = rows[r][i];
            }

            y[j - 1] = 0;
            lu.Solve(y, l);
            var max = l.Maximum();
            var sum = 0.0;
            for (var c = 0; c < j; c++)
            {
                var x = Math.Exp(l[c] - max);
                values[(r * j) + c] = x;
                sum += x;
            }

            Close(parts, values, r, j, sum, total);
        }
    }

    private static void SolveInParts(IReadOnlyList<string> parts, IReadOnlyList<LogRatio> ratios, IReadOnlyList<double[]> rows, double total, double[] values, CancellationToken cancellationToken)
    {
        var j = parts.Count;
        var a = Matrix<double>.Build.Dense(j, j);
        var rhs = Vector<double>.Build.Dense(j);
        var x = Vector<double>.Build.Dense(j);
        rhs[j - 1] = total;
        for (var r = 0; r < rows.Count; r++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            a.Clear();
            for (var i = 0; i < ratios.Count; i++)
            {
                // Σ_A x − e^y Σ_B x = 0, scaled so the larger coefficient is 1 (no overflow for large |y|).
                var y = rows[r][i];
                double numCoefficient = y > 0 ? Math.Exp(-y) : 1, denCoefficient = y > 0 ? 1 : Math.Exp(y);
                foreach (var c in ratios[i].Numerator)
                {
                    a[i, c] = numCoefficient;
                }

                foreach (var c in ratios[i].Denominator)
                {
                    a[i, c] = -denCoefficient;
                }
            }

            for (var c = 0; c < j; c++)
            {
                a[j - 1, c] = 1;
            }

            var lu = a.LU();
            var rowPointer = string.Create(CultureInfo.InvariantCulture, $"/rows/{r}");
            var condition = lu.Determinant == 0 ? double.PositiveInfinity : a.L1Norm() * lu.Inverse().L1Norm();
            if (!(condition <= MaxConditionNumber))
            {
                var detail = string.Create(CultureInfo.InvariantCulture, $"With the values of row {r} the equations of the ratio set are singular or ill-conditioned (condition number {condition:G3} > {MaxConditionNumber:G1}).");
                throw new CompositionException(ProblemTypes.SingularRatioSet, detail, [new ProblemError("/ratios", detail), new ProblemError(rowPointer, detail)]);
            }

            lu.Solve(rhs, x);
            var sum = 0.0;
            for (var c = 0; c < j; c++)
            {
                values[(r * j) + c] = x[c];
                sum += x[c];
            }

            Close(parts, values, r, j, sum, total);
        }
    }

    private static void Close(IReadOnlyList<string> parts, double[] values, int r, int j, double sum, double total)
    {
        for (var c = 0; c < j; c++)
        {
            var v = values[(r * j) + c];
            if (!(v > 0) || !double.IsFinite(v))
            {
                throw new CompositionException(
                    ProblemTypes.InfeasibleRatioValues,
                    string.Create(CultureInfo.InvariantCulture, $"/rows/{r}"),
                    string.Create(CultureInfo.InvariantCulture, $"No composition has these ratio values: solving for them makes part '{parts[c]}' {(double.IsFinite(v) && v < 0 ? "negative" : "zero")}."));
            }
        }

        var scale = total / sum;
        for (var c = 0; c < j; c++)
        {
            values[(r * j) + c] *= scale;
        }
    }

    private static void CheckRows(IReadOnlyList<double[]> rows, int k)
    {
        if (rows.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/rows", "At least one row of ratio values is needed.");
        }

        var errors = new List<ProblemError>();
        for (var r = 0; r < rows.Count && errors.Count < 20; r++)
        {
            var row = rows[r];
            if (row is null || row.Length != k)
            {
                throw new CompositionException(
                    ProblemTypes.InvalidInput,
                    string.Create(CultureInfo.InvariantCulture, $"/rows/{r}"),
                    string.Create(CultureInfo.InvariantCulture, $"Row {r} has {row?.Length ?? 0} values for {k} ratios."));
            }

            for (var c = 0; c < k && errors.Count < 20; c++)
            {
                if (!double.IsFinite(row[c]))
                {
                    errors.Add(new ProblemError(string.Create(CultureInfo.InvariantCulture, $"/rows/{r}/{c}"), "The value is not a finite number."));
                }
            }
        }

        if (errors.Count > 0)
        {
            throw new CompositionException(ProblemTypes.NonFiniteValue, $"{errors.Count} ratio value(s) are not finite numbers (at most 20 are listed).", errors);
        }
    }

    private static string IncompleteDetail(IReadOnlyList<string> parts, IReadOnlyList<LogRatio> ratios)
    {
        if (ratios.All(r => r.Kind == RatioKind.Pairwise))
        {
            var components = Components(parts.Count, ratios);
            var groups = Enumerable.Range(0, parts.Count)
                .GroupBy(c => components[c])
                .Select(g => "{" + string.Join(", ", g.Select(c => parts[c])) + "}");
            return $"The ratios do not connect all parts, so the parts in different groups are not determined relative to each other: {string.Join(" ", groups)}. Pairwise ratios invert when they form a spanning tree of the parts.";
        }

        return string.Create(
            CultureInfo.InvariantCulture,
            $"The ratios determine only {JacobianRank(parts.Count, ratios)} of the {parts.Count - 1} degrees of freedom of a composition of {parts.Count} parts: some are combinations of the others.");
    }

    private static int[] Components(int j, IReadOnlyList<LogRatio> ratios)
    {
        var parent = Enumerable.Range(0, j).ToArray();
        int Root(int x)
        {
            while (parent[x] != x)
            {
                parent[x] = parent[parent[x]];
                x = parent[x];
            }

            return x;
        }

        foreach (var r in ratios)
        {
            parent[Root(r.Numerator[0])] = Root(r.Denominator[0]);
        }

        return [.. Enumerable.Range(0, j).Select(Root)];
    }

    private static int JacobianRank(int j, IReadOnlyList<LogRatio> ratios)
    {
        var x = new double[j];
        for (var c = 0; c < j; c++)
        {
            var u = (0.5 + ((c + 1) * 0.6180339887498949)) % 1.0;
            x[c] = Math.Exp(2 * u);
        }

        var jac = Matrix<double>.Build.Dense(ratios.Count, j);
        for (var i = 0; i < ratios.Count; i++)
        {
            var ratio = ratios[i];
            if (ratio.Kind == RatioKind.Amalgamation)
            {
                // ∂ ln(Σ_A x / Σ_B x) / ∂ ln x_c = x_c / Σ_A x for c ∈ A, −x_c / Σ_B x for c ∈ B.
                double sa = ratio.Numerator.Sum(c => x[c]), sb = ratio.Denominator.Sum(c => x[c]);
                foreach (var c in ratio.Numerator)
                {
                    jac[i, c] = x[c] / sa;
                }

                foreach (var c in ratio.Denominator)
                {
                    jac[i, c] = -x[c] / sb;
                }
            }
            else
            {
                var contrast = ratio.LogContrast(j)!;
                for (var c = 0; c < j; c++)
                {
                    jac[i, c] = contrast[c];
                }
            }
        }

        var s = jac.Svd(computeVectors: false).S;
        var max = s.Count > 0 ? s.Maximum() : 0;
        return s.Count(v => v > 1e-9 * max);
    }

    private static int IndexOfKind(IReadOnlyList<LogRatio> ratios, RatioKind kind)
    {
        for (var i = 0; i < ratios.Count; i++)
        {
            if (ratios[i].Kind == kind)
            {
                return i;
            }
        }

        return -1;
    }

    private static void CheckIndices(int j, IReadOnlyList<LogRatio> ratios)
    {
        foreach (var r in ratios)
        {
            if (r is null || r.Numerator.Concat(r.Denominator).Any(c => c < 0 || c >= j))
            {
                throw new ArgumentException("Every ratio must refer to parts of the given list.", nameof(ratios));
            }
        }
    }
}
