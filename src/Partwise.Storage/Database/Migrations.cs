using System.Data.Common;
using System.Globalization;
using System.Reflection;

namespace Partwise.Storage.Database;

/// <summary>One schema migration: an SQL script embedded as migrations/{provider}/{version:0000}_{name}.sql.</summary>
internal sealed record Migration(int Version, string Name, string Sql);

/// <summary>
/// Versioned schema migrations. Each provider has its ordered scripts; <c>schema_version</c> lists those applied.
/// All pending scripts run in one transaction (DDL is transactional in both providers), after the provider's
/// migration lock, so two replicas starting together do not both apply them and a failed script leaves the schema
/// as it was.
/// </summary>
internal static class Migrations
{
    private const string ResourcePrefix = "migrations/";

    /// <summary>The scripts of the provider whose folder is <paramref name="folder"/>, in version order.</summary>
    public static IReadOnlyList<Migration> For(string folder)
    {
        var assembly = typeof(Migrations).Assembly;
        var prefix = $"{ResourcePrefix}{folder}/";
        var migrations = new List<Migration>();
        foreach (var resource in assembly.GetManifestResourceNames().Where(n => n.StartsWith(prefix, StringComparison.Ordinal)))
        {
            var file = Path.GetFileNameWithoutExtension(resource[prefix.Length..]);
            var separator = file.IndexOf('_', StringComparison.Ordinal);
            var version = int.Parse(file[..separator], NumberStyles.None, CultureInfo.InvariantCulture);
            migrations.Add(new Migration(version, file[(separator + 1)..], Read(assembly, resource)));
        }

        migrations.Sort((a, b) => a.Version.CompareTo(b.Version));
        for (var i = 0; i < migrations.Count; i++)
        {
            if (migrations[i].Version != i + 1)
            {
                throw new InvalidOperationException($"The {folder} migrations must be numbered 1, 2, 3... without gaps.");
            }
        }

        return migrations;
    }

    /// <summary>Applies the pending migrations and returns the schema version afterwards.</summary>
    public static Task<int> ApplyAsync(StoreDatabase database, CancellationToken cancellationToken)
    {
        var dialect = database.Dialect;
        var scripts = For(dialect.MigrationFolder);
        return database.WriteAsync<int>(async (connection, transaction, ct) =>
        {
            if (dialect.MigrationLock is { } lockSql)
            {
                await using var lockCommand = connection.Command(transaction, lockSql);
                await lockCommand.ExecuteNonQueryAsync(ct);
            }

            await using (var create = connection.Command(transaction, dialect.SchemaVersionTable))
            {
                await create.ExecuteNonQueryAsync(ct);
            }

            var applied = await AppliedAsync(connection, transaction, ct);
            foreach (var migration in scripts.Where(m => !applied.Contains(m.Version)))
            {
                await using (var script = connection.Command(transaction, migration.Sql))
                {
                    await script.ExecuteNonQueryAsync(ct);
                }

                await using var record = connection.Command(
                    transaction,
                    "INSERT INTO schema_version (version, name, applied_at) VALUES (@version, @name, @appliedAt)");
                record.Add("@version", (long)migration.Version);
                record.Add("@name", migration.Name);
                dialect.AddTimestamp(record, "@appliedAt", database.Now());
                await record.ExecuteNonQueryAsync(ct);
                applied.Add(migration.Version);
            }

            return (applied.Count == 0 ? 0 : applied.Max(), true);
        }, cancellationToken);
    }

    /// <summary>The schema version of the database, or 0 when it has never been migrated.</summary>
    public static async Task<int> CurrentVersionAsync(DbConnection connection, StoreDialect dialect, CancellationToken cancellationToken)
    {
        await using var exists = connection.Command(null, dialect.SchemaVersionTableExists);
        if (Convert.ToInt64(await exists.ExecuteScalarAsync(cancellationToken), CultureInfo.InvariantCulture) == 0)
        {
            return 0;
        }

        await using var max = connection.Command(null, "SELECT coalesce(max(version), 0) FROM schema_version");
        return (int)Convert.ToInt64(await max.ExecuteScalarAsync(cancellationToken), CultureInfo.InvariantCulture);
    }

    private static async Task<HashSet<int>> AppliedAsync(DbConnection connection, DbTransaction transaction, CancellationToken cancellationToken)
    {
        await using var select = connection.Command(transaction, "SELECT version FROM schema_version");
        await using var reader = await select.ExecuteReaderAsync(cancellationToken);
        var versions = new HashSet<int>();
        while (await reader.ReadAsync(cancellationToken))
        {
            versions.Add((int)reader.GetInt64(0));
        }

        return versions;
    }

    private static string Read(Assembly assembly, string resource)
    {
        using var stream = assembly.GetManifestResourceStream(resource)
            ?? throw new InvalidOperationException($"The migration resource {resource} is missing.");
        using var reader = new StreamReader(stream);
        return reader.ReadToEnd();
    }
}
