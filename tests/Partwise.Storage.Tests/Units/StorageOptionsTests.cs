using Partwise.Storage.Database;

namespace Partwise.Storage.Tests.Units;

public sealed class StorageOptionsTests
{
    [Fact]
    public void DefaultsAreSqliteInTheDataDirectory()
    {
        var options = new StorageOptions();

        Assert.Equal("./data", options.DataDirectory);
        Assert.False(options.UsesPostgres);
        Assert.Equal(TimeSpan.FromMilliseconds(200), options.ChangePollInterval);
        Assert.Equal(SqliteSynchronous.Full, options.SqliteSynchronous);
        Assert.Empty(options.Validate());
        Assert.False(new StorageOptions { PostgresConnectionString = "  " }.UsesPostgres);
    }

    [Fact]
    public void ValidationNamesTheBadSetting()
    {
        Assert.Contains(new StorageOptions { DataDirectory = "" }.Validate(), p => p.Contains("DataDirectory", StringComparison.Ordinal));
        Assert.Contains(new StorageOptions { ChangePollInterval = TimeSpan.Zero }.Validate(), p => p.Contains("ChangePollInterval", StringComparison.Ordinal));
        Assert.Contains(new StorageOptions { SqliteSynchronous = (SqliteSynchronous)7 }.Validate(), p => p.Contains("SqliteSynchronous", StringComparison.Ordinal));
        Assert.Contains(new StorageOptions { PostgresConnectionString = "Host=db;Colour=blue" }.Validate(), p => p.Contains("PostgresConnectionString", StringComparison.Ordinal));
        Assert.Contains(new StorageOptions { PostgresConnectionString = "Host=db;Port=fifty" }.Validate(), p => p.Contains("PostgresConnectionString", StringComparison.Ordinal));
        Assert.Empty(new StorageOptions { PostgresConnectionString = "Host=db;Port=5432;Database=partwise;Username=partwise;Timeout=3" }.Validate());
        Assert.Throws<ArgumentException>(() => new PartwiseStorage(new StorageOptions { DataDirectory = " " }));
    }

    [Fact]
    public async Task ConstructingTheStoreTouchesNoDiskAndNoServer()
    {
        var directory = Path.Combine(Path.GetTempPath(), "partwise-store-tests", Guid.NewGuid().ToString("N"));

        await using (var sqlite = new PartwiseStorage(new StorageOptions { DataDirectory = directory }))
        {
            Assert.Equal("sqlite", sqlite.Provider);
        }

        // Port 1 on loopback has no server: constructing must not notice.
        await using (var postgres = new PartwiseStorage(new StorageOptions { PostgresConnectionString = "Host=127.0.0.1;Port=1;Database=partwise" }))
        {
            Assert.Equal("postgresql", postgres.Provider);
            Assert.IsType<PostgresDialect>(postgres.Database.Dialect);
        }

        Assert.False(Directory.Exists(directory));
    }

    [Fact]
    public void AMalformedConnectionStringFailsAtConstruction()
    {
        Assert.ThrowsAny<ArgumentException>(() => new PartwiseStorage(new StorageOptions { PostgresConnectionString = "Host=127.0.0.1;NoSuchKeyword=1" }));
    }
}
