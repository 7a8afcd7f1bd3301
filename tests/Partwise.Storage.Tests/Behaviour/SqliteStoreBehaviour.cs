using Microsoft.Data.Sqlite;
using Partwise.Storage.Database;

namespace Partwise.Storage.Tests.Behaviour;

/// <summary>The suite on SQLite, each test in a fresh temporary directory.</summary>
public sealed class SqliteStoreBehaviour : StoreBehaviour
{
    private readonly List<string> directories = [];

    protected override Task<StorageOptions> FreshDatabaseAsync()
    {
        var directory = Path.Combine(Path.GetTempPath(), "partwise-store-tests", Guid.NewGuid().ToString("N"));
        directories.Add(directory);
        // The directory does not exist yet: the store creates it.
        return Task.FromResult(new StorageOptions { DataDirectory = directory });
    }

    protected override Task CleanUpAsync()
    {
        foreach (var directory in directories.Where(Directory.Exists))
        {
            Directory.Delete(directory, recursive: true);
        }

        return Task.CompletedTask;
    }

    [Fact]
    public async Task TheDatabaseIsTheFileNamedInTheOptionsInsideTheDataDirectory()
    {
        var dialect = Assert.IsType<SqliteDialect>(Store.Database.Dialect);

        Assert.Equal(Path.Combine(Path.GetFullPath(Options.DataDirectory), "partwise.db"), dialect.FilePath);
        Assert.True(File.Exists(dialect.FilePath));
        await Store.PingAsync(CancellationToken.None);
    }

    [Fact]
    public async Task ConnectionsUseTheWriteAheadLogWithFullSynchronousCommits()
    {
        await using var connection = (SqliteConnection)await Store.Database.Dialect.OpenAsync(CancellationToken.None);

        Assert.Equal("wal", await ScalarAsync(connection, "PRAGMA journal_mode"));
        // 2 = FULL (https://sqlite.org/pragma.html#pragma_synchronous)
        Assert.Equal(2L, await ScalarAsync(connection, "PRAGMA synchronous"));
        Assert.Equal(1L, await ScalarAsync(connection, "PRAGMA foreign_keys"));
    }

    [Fact]
    public async Task NormalSynchronousIsUsedWhenTheOptionsAskForIt()
    {
        var store = Open(new StorageOptions { DataDirectory = Options.DataDirectory, SqliteSynchronous = SqliteSynchronous.Normal });
        await using var connection = (SqliteConnection)await store.Database.Dialect.OpenAsync(CancellationToken.None);

        // 1 = NORMAL (https://sqlite.org/pragma.html#pragma_synchronous)
        Assert.Equal(1L, await ScalarAsync(connection, "PRAGMA synchronous"));
        Assert.Equal("wal", await ScalarAsync(connection, "PRAGMA journal_mode"));
    }

    private static async Task<object?> ScalarAsync(SqliteConnection connection, string sql)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return await command.ExecuteScalarAsync();
    }
}
