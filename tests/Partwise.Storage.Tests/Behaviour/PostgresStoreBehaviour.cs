using Npgsql;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

/// <summary>
/// The suite on PostgreSQL (PARTWISE_POSTGRES), each test in a fresh schema of that database, dropped afterwards;
/// the store reaches its schema through the connection's search path.
/// </summary>
[NeedsPostgres]
public sealed class PostgresStoreBehaviour : StoreBehaviour
{
    private readonly List<string> schemas = [];

    protected override async Task<StorageOptions> FreshDatabaseAsync()
    {
        var admin = PostgresEnvironment.RequireConnectionString();
        var schema = "partwise_test_" + Guid.NewGuid().ToString("N");
        await ExecuteAsync(admin, $"CREATE SCHEMA {schema}");
        schemas.Add(schema);
        var builder = new NpgsqlConnectionStringBuilder(admin) { SearchPath = schema };
        return new StorageOptions { PostgresConnectionString = builder.ConnectionString };
    }

    protected override async Task CleanUpAsync()
    {
        if (PostgresEnvironment.ConnectionString is not { } admin)
        {
            return;
        }

        foreach (var schema in schemas)
        {
            await ExecuteAsync(admin, $"DROP SCHEMA IF EXISTS {schema} CASCADE");
        }
    }

    [PostgresFact]
    public async Task TablesAreCreatedInTheSchemaOfTheSearchPathOnly()
    {
        var admin = PostgresEnvironment.RequireConnectionString();
        var schema = new NpgsqlConnectionStringBuilder(Options.PostgresConnectionString).SearchPath!;
        await using var connection = new NpgsqlConnection(admin);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "SELECT table_schema, table_name FROM information_schema.tables WHERE table_name IN ('flags', 'baselines', 'schema_version') ORDER BY 2",
            connection);
        var found = new List<(string Schema, string Table)>();
        await using (var reader = await command.ExecuteReaderAsync())
        {
            while (await reader.ReadAsync())
            {
                found.Add((reader.GetString(0), reader.GetString(1)));
            }
        }

        // Other tests' schemas may exist meanwhile; this test's tables are in its own, and none is in public.
        Assert.Contains((schema, "baselines"), found);
        Assert.Contains((schema, "flags"), found);
        Assert.Contains((schema, "schema_version"), found);
        Assert.DoesNotContain(found, f => f.Schema == "public");
    }

    // Schema names are made here from a GUID (letters, digits and underscores): nothing to quote or inject.
    private static async Task ExecuteAsync(string connectionString, string sql)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync();
    }
}
