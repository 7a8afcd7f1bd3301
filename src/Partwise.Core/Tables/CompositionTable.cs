using Partwise.Core.Problems;

namespace Partwise.Core.Tables;

/// <summary>
/// A validated table of compositions: n rows (samples) of J parts, stored row-major in one contiguous array so
/// that transforms run over spans without per-row allocation.
/// </summary>
/// <remarks>
/// Invariants, checked once at construction: J ≥ 2 unique, non-empty part names; every row has J finite,
/// non-negative values; ids, when given, are unique, non-empty and one per row. Zeros are allowed here: the zero
/// policy (see <c>Partwise.Core.Zeros</c>) decides what happens to them. Offending cells are reported with
/// JSON pointers <c>/parts/j</c>, <c>/rows/i/j</c> and <c>/ids/i</c>, the layout of the contract's Table shape.
/// </remarks>
public sealed class CompositionTable
{
    private readonly Dictionary<string, int> _partIndex;

    private CompositionTable(string[] parts, double[] values, int rowCount, string[]? ids, Dictionary<string, int> partIndex)
    {
        Parts = parts;
        Values = values;
        RowCount = rowCount;
        Ids = ids;
        _partIndex = partIndex;
    }

    /// <summary>The part names, in table order.</summary>
    public IReadOnlyList<string> Parts { get; }

    /// <summary>The values, row-major: the value of part j in row i is at <c>i * PartCount + j</c>.</summary>
    public double[] Values { get; }

    /// <summary>Optional sample identifiers, one per row.</summary>
    public IReadOnlyList<string>? Ids { get; }

    /// <summary>The number of rows n.</summary>
    public int RowCount { get; }

    /// <summary>The number of parts J.</summary>
    public int PartCount => Parts.Count;

    /// <summary>The values of row <paramref name="i"/>.</summary>
    public ReadOnlySpan<double> Row(int i) => Values.AsSpan(i * PartCount, PartCount);

    /// <summary>The index of a part, or −1 if the table has no such part.</summary>
    public int IndexOf(string part) => _partIndex.TryGetValue(part, out var j) ? j : -1;

    /// <summary>
    /// The index of a part, or a <see cref="ProblemTypes.UnknownPart"/> problem pointing at <paramref name="pointer"/>.
    /// </summary>
    public int RequireIndex(string part, string pointer)
    {
        var j = IndexOf(part);
        return j >= 0
            ? j
            : throw new CompositionException(ProblemTypes.UnknownPart, pointer, $"The table has no part named '{part}'.");
    }

    /// <summary>
    /// Validates and builds a table from jagged rows, as a JSON body delivers them.
    /// </summary>
    /// <param name="parts">J ≥ 2 unique, non-empty names.</param>
    /// <param name="rows">n ≥ 1 rows of J finite, non-negative values.</param>
    /// <param name="ids">Optional unique ids, one per row.</param>
    /// <exception cref="CompositionException">With pointers to every offending cell (at most 20 are listed).</exception>
    public static CompositionTable FromRows(IReadOnlyList<string> parts, IReadOnlyList<double[]> rows, IReadOnlyList<string>? ids = null)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(rows);
        var partIndex = ValidateParts(parts);
        var j = parts.Count;
        if (rows.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/rows", "The table needs at least one row.");
        }

        var values = new double[checked(rows.Count * j)];
        for (var i = 0; i < rows.Count; i++)
        {
            var row = rows[i];
            if (row is null || row.Length != j)
            {
                throw new CompositionException(
                    ProblemTypes.InvalidInput,
                    $"/rows/{i}",
                    $"Row {i} has {row?.Length ?? 0} values but the table has {j} parts.");
            }

            row.CopyTo(values, i * j);
        }

        return FromValues(parts, values, rows.Count, ids, partIndex);
    }

    /// <summary>
    /// Validates and builds a table from a row-major array (taken over, not copied), as the CSV reader delivers it.
    /// </summary>
    /// <param name="parts">J ≥ 2 unique, non-empty names.</param>
    /// <param name="values">n × J values, row-major, finite and non-negative.</param>
    /// <param name="ids">Optional unique ids, one per row.</param>
    /// <exception cref="CompositionException">With pointers to every offending cell (at most 20 are listed).</exception>
    public static CompositionTable FromValues(IReadOnlyList<string> parts, double[] values, IReadOnlyList<string>? ids = null)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(values);
        var partIndex = ValidateParts(parts);
        if (values.Length == 0 || values.Length % parts.Count != 0)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/rows", "The table needs at least one full row.");
        }

        return FromValues(parts, values, values.Length / parts.Count, ids, partIndex);
    }

    /// <summary>A table with the same parts and ids and new values of the same shape (for closure and replacement).</summary>
    internal CompositionTable WithValues(double[] values)
    {
        if (values.Length != Values.Length)
        {
            throw new ArgumentException("The new values must have the table's shape.", nameof(values));
        }

        return new CompositionTable((string[])Parts, values, RowCount, (string[]?)Ids, _partIndex);
    }

    private static CompositionTable FromValues(IReadOnlyList<string> parts, double[] values, int n, IReadOnlyList<string>? ids, Dictionary<string, int> partIndex)
    {
        var j = parts.Count;
        var errors = new List<ProblemError>();
        string? type = null;
        for (var k = 0; k < values.Length && errors.Count < 20; k++)
        {
            var v = values[k];
            if (double.IsFinite(v) && v >= 0)
            {
                continue;
            }

            var (problem, detail) = double.IsFinite(v)
                ? (ProblemTypes.NegativeValue, $"The value {v.ToString("R", System.Globalization.CultureInfo.InvariantCulture)} is negative; compositions are non-negative.")
                : (ProblemTypes.NonFiniteValue, "The value is not a finite number.");
            type ??= problem;
            errors.Add(new ProblemError($"/rows/{k / j}/{k % j}", detail));
        }

        if (type is not null)
        {
            throw new CompositionException(type, $"{errors.Count} cell(s) of the table cannot be used.", errors);
        }

        string[]? idArray = null;
        if (ids is not null)
        {
            if (ids.Count != n)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, "/ids", $"There are {ids.Count} ids for {n} rows.");
            }

            idArray = [.. ids];
            var seen = new HashSet<string>(StringComparer.Ordinal);
            for (var i = 0; i < idArray.Length; i++)
            {
                if (string.IsNullOrEmpty(idArray[i]))
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, $"/ids/{i}", "An id must not be empty.");
                }

                if (!seen.Add(idArray[i]))
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, $"/ids/{i}", $"The id '{idArray[i]}' appears more than once.");
                }
            }
        }

        return new CompositionTable([.. parts], values, n, idArray, partIndex);
    }

    private static Dictionary<string, int> ValidateParts(IReadOnlyList<string> parts)
    {
        if (parts.Count < 2)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/parts", "A composition needs at least two parts.");
        }

        var index = new Dictionary<string, int>(parts.Count, StringComparer.Ordinal);
        for (var j = 0; j < parts.Count; j++)
        {
            var name = parts[j];
            if (string.IsNullOrWhiteSpace(name))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, $"/parts/{j}", "A part name must not be empty.");
            }

            if (!index.TryAdd(name, j))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, $"/parts/{j}", $"The part name '{name}' appears more than once.");
            }
        }

        return index;
    }
}
