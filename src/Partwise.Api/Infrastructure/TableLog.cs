using Partwise.Core.Tables;
using Serilog;

namespace Partwise.Api.Infrastructure;

/// <summary>The shape fields a handler adds to its request's completion event: counts, never values.</summary>
public static class TableLog
{
    /// <summary>Adds PartCount and RowCount.</summary>
    public static void DescribeTable(this IDiagnosticContext diagnostics, CompositionTable table)
    {
        ArgumentNullException.ThrowIfNull(diagnostics);
        ArgumentNullException.ThrowIfNull(table);
        diagnostics.Set("PartCount", table.PartCount);
        diagnostics.Set("RowCount", table.RowCount);
    }
}
