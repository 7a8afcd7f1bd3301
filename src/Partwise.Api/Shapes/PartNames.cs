using Partwise.Core.Tables;

namespace Partwise.Api.Shapes;

/// <summary>Checks part names given without a table (the <c>parts</c> of an inverse transform).</summary>
public static class PartNames
{
    /// <summary>
    /// Validates <paramref name="parts"/> by the table's own rules (two or more unique, non-empty names; problems at
    /// <c>/parts/j</c>) and returns a one-row table of ones over them, for looking parts up by name.
    /// </summary>
    /// <exception cref="Partwise.Core.Problems.CompositionException">The names break a rule of the table.</exception>
    public static CompositionTable Require(IReadOnlyList<string> parts)
    {
        ArgumentNullException.ThrowIfNull(parts);
        var ones = new double[parts.Count];
        Array.Fill(ones, 1.0);
        return CompositionTable.FromValues(parts, ones);
    }
}
