using Npgsql;

namespace Partwise.Storage;

/// <summary>
/// Where the store keeps its data. With <see cref="PostgresConnectionString"/> set, PostgreSQL is used (several
/// replicas may share it); otherwise SQLite in the file <see cref="SqliteFileName"/> inside <see cref="DataDirectory"/>
/// (one process). Bound from the configuration section <see cref="SectionName"/>; the defaults are in code.
/// </summary>
public sealed class StorageOptions
{
    /// <summary>The configuration section these options are bound from.</summary>
    public const string SectionName = "Storage";

    /// <summary>The default <see cref="DataDirectory"/>, relative to the working directory.</summary>
    public const string DefaultDataDirectory = "./data";

    /// <summary>The name of the SQLite database file inside <see cref="DataDirectory"/>.</summary>
    public const string SqliteFileName = "partwise.db";

    /// <summary>The directory of the SQLite database; created, with the file, on the first connection (never before).</summary>
    public string DataDirectory { get; set; } = DefaultDataDirectory;

    /// <summary>An Npgsql connection string; when set (not blank), PostgreSQL is used and <see cref="DataDirectory"/> is ignored.</summary>
    public string? PostgresConnectionString { get; set; }

    /// <summary>
    /// How SQLite makes a commit durable (its <c>synchronous</c> setting, https://sqlite.org/pragma.html#pragma_synchronous).
    /// <see cref="SqliteSynchronous.Full"/> (the default) fsyncs the write-ahead log at every commit: an acknowledged
    /// screening survives a killed process, an OS crash and a power cut. <see cref="SqliteSynchronous.Normal"/> leaves
    /// the log to the OS between checkpoints: an acknowledged screening survives a killed process (the crash test
    /// checks this) but the last commits can be lost to an OS crash or power cut; each commit then costs no fsync.
    /// Ignored with PostgreSQL, whose durability is the server's.
    /// </summary>
    public SqliteSynchronous SqliteSynchronous { get; set; } = SqliteSynchronous.Full;

    /// <summary>
    /// How often a waiter on <c>IFlagStore.WaitForChangeAsync</c> looks for changes committed by other connections
    /// (other replicas); changes made through the same store instance wake waiters at once. Default 200 ms; valid
    /// range 10 ms to 10 s.
    /// </summary>
    public TimeSpan ChangePollInterval { get; set; } = TimeSpan.FromMilliseconds(200);

    /// <summary>True when these options select PostgreSQL.</summary>
    public bool UsesPostgres => !string.IsNullOrWhiteSpace(PostgresConnectionString);

    /// <summary>The problems with these options, empty when they are usable. Touches no file and no server.</summary>
    public IReadOnlyList<string> Validate()
    {
        var problems = new List<string>();
        if (!UsesPostgres && string.IsNullOrWhiteSpace(DataDirectory))
        {
            problems.Add($"{SectionName}:{nameof(DataDirectory)} must name a directory when no PostgreSQL connection string is set.");
        }

        if (!Enum.IsDefined(SqliteSynchronous))
        {
            problems.Add($"{SectionName}:{nameof(SqliteSynchronous)} must be Full or Normal.");
        }

        if (UsesPostgres && !IsConnectionString(PostgresConnectionString!))
        {
            // The problem names the setting, never its text: a connection string may hold a password.
            problems.Add($"{SectionName}:{nameof(PostgresConnectionString)} is not a PostgreSQL connection string: Keyword=value pairs separated by ';' with known keywords, such as Host=db;Port=5432;Database=partwise;Username=partwise.");
        }

        if (ChangePollInterval < TimeSpan.FromMilliseconds(10) || ChangePollInterval > TimeSpan.FromSeconds(10))
        {
            problems.Add($"{SectionName}:{nameof(ChangePollInterval)} must lie between 10 ms and 10 s.");
        }

        return problems;
    }

    private static bool IsConnectionString(string text)
    {
        try
        {
            _ = new NpgsqlConnectionStringBuilder(text);
            return true;
        }
        catch (Exception e) when (e is ArgumentException or FormatException or InvalidCastException or OverflowException)
        {
            return false;
        }
    }
}

/// <summary>SQLite's <c>synchronous</c> setting for the store's connections (write-ahead log mode).</summary>
public enum SqliteSynchronous
{
    /// <summary>fsync of the log at every commit: durable against power loss.</summary>
    Full,

    /// <summary>No fsync at commit: durable against a killed process, not against an OS crash or power loss.</summary>
    Normal,
}
