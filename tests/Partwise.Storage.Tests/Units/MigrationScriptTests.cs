using Partwise.Storage.Database;

namespace Partwise.Storage.Tests.Units;

public sealed class MigrationScriptTests
{
    [Fact]
    public void BothProvidersHaveTheSameNumberedMigrations()
    {
        var sqlite = Migrations.For("Sqlite");
        var postgres = Migrations.For("Postgres");

        Assert.NotEmpty(sqlite);
        Assert.Equal(sqlite.Select(m => (m.Version, m.Name)), postgres.Select(m => (m.Version, m.Name)));
        Assert.All(sqlite.Concat(postgres), m => Assert.False(string.IsNullOrWhiteSpace(m.Sql)));
    }
}
