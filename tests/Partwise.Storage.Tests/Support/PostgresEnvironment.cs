namespace Partwise.Storage.Tests.Support;

/// <summary>
/// The PostgreSQL server the PostgreSQL tests use: PARTWISE_POSTGRES, a connection string to a throwaway cluster
/// (each test makes and drops its own schema there). Without it those tests skip, saying so; with
/// PARTWISE_REQUIRE_EXTERNAL=1 (set by .ci/run) they run anyway, so a missing server fails them.
/// </summary>
public static class PostgresEnvironment
{
    /// <summary>The environment variable holding the connection string.</summary>
    public const string Variable = "PARTWISE_POSTGRES";

    /// <summary>What a skipped test says.</summary>
    public const string SkipMessage = "needs PostgreSQL: set PARTWISE_POSTGRES";

    /// <summary>The connection string, or null when unset.</summary>
    public static string? ConnectionString =>
        Environment.GetEnvironmentVariable(Variable) is { Length: > 0 } value ? value : null;

    /// <summary>True when external dependencies must be present (tests fail instead of skipping).</summary>
    public static bool Required => Environment.GetEnvironmentVariable("PARTWISE_REQUIRE_EXTERNAL") == "1";

    /// <summary>Why PostgreSQL tests skip here, or null when they run.</summary>
    public static string? SkipReason => ConnectionString is null && !Required ? SkipMessage : null;

    /// <summary>The connection string, or a failure explaining that it is required but missing.</summary>
    public static string RequireConnectionString() =>
        ConnectionString ?? throw new InvalidOperationException(
            $"PARTWISE_REQUIRE_EXTERNAL=1 but {Variable} is not set: {SkipMessage} (tests/Partwise.Storage.Tests/postgres-throwaway.sh start prints one).");
}

/// <summary>A fact that needs PostgreSQL: it skips, saying why, without PARTWISE_POSTGRES unless PARTWISE_REQUIRE_EXTERNAL=1.</summary>
[AttributeUsage(AttributeTargets.Method)]
public sealed class PostgresFactAttribute : FactAttribute
{
    /// <summary>Sets <see cref="FactAttribute.Skip"/> when PostgreSQL is not configured and not required.</summary>
    public PostgresFactAttribute()
    {
        if (PostgresEnvironment.SkipReason is { } why)
        {
            Skip = why;
        }
    }
}
