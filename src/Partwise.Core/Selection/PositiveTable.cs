using System.Globalization;
using Partwise.Core.Problems;
using Partwise.Core.Tables;

namespace Partwise.Core.Selection;

/// <summary>Checks that a table is strictly positive, as every log-ratio needs (the zero policy runs first).</summary>
internal static class PositiveTable
{
    /// <summary>Throws a <see cref="ProblemTypes.ZeroValue"/> problem listing up to 20 zero cells as <c>/rows/i/j</c>.</summary>
    public static void Require(CompositionTable table)
    {
        var values = table.Values;
        var j = table.PartCount;
        List<ProblemError>? errors = null;
        for (var k = 0; k < values.Length; k++)
        {
            if (values[k] > 0)
            {
                continue;
            }

            errors ??= [];
            errors.Add(new ProblemError(
                string.Create(CultureInfo.InvariantCulture, $"/rows/{k / j}/{k % j}"),
                "The value is zero; log-ratios need positive values, so apply a zero policy first."));
            if (errors.Count == 20)
            {
                break;
            }
        }

        if (errors is not null)
        {
            throw new CompositionException(ProblemTypes.ZeroValue, $"{errors.Count} cell(s) are zero (at most 20 are listed).", errors);
        }
    }
}
