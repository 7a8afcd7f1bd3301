using System.Data.Common;

namespace Partwise.Storage.Database;

/// <summary>Parameterised commands without provider types.</summary>
internal static class CommandExtensions
{
    /// <summary>A command on <paramref name="connection"/> in <paramref name="transaction"/> (or none).</summary>
    public static DbCommand Command(this DbConnection connection, DbTransaction? transaction, string sql)
    {
        var command = connection.CreateCommand();
        command.Transaction = transaction;
        command.CommandText = sql;
        return command;
    }

    /// <summary>Adds the parameter <c>@name</c>; null becomes SQL NULL.</summary>
    public static DbParameter Add(this DbCommand command, string name, object? value)
    {
        var parameter = command.CreateParameter();
        parameter.ParameterName = name;
        parameter.Value = value ?? DBNull.Value;
        command.Parameters.Add(parameter);
        return parameter;
    }

    /// <summary>Sets the value of the parameter <c>@name</c> already added; null becomes SQL NULL.</summary>
    public static void Set(this DbCommand command, string name, object? value) =>
        command.Parameters[name].Value = value ?? DBNull.Value;

    /// <summary>A nullable string column.</summary>
    public static string? GetNullableString(this DbDataReader reader, int ordinal) =>
        reader.IsDBNull(ordinal) ? null : reader.GetString(ordinal);
}
