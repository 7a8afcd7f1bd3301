using Partwise.Storage.Flags;

namespace Partwise.Storage.Tests.Units;

public sealed class UnavailableStorageTests : IDisposable
{
    private readonly string root = Path.Combine(Path.GetTempPath(), "partwise-store-tests", Guid.NewGuid().ToString("N"));

    public UnavailableStorageTests() => Directory.CreateDirectory(root);

    public void Dispose() => Directory.Delete(root, recursive: true);

    [Fact]
    public async Task ADataDirectoryThatCannotBeCreatedIsStorageUnavailable()
    {
        // A regular file where a parent directory should be: no user (root included) can create the directory.
        var file = Path.Combine(root, "not-a-directory");
        await File.WriteAllTextAsync(file, "x");
        await using var store = new PartwiseStorage(new StorageOptions { DataDirectory = Path.Combine(file, "data") });

        await Assert.ThrowsAsync<StorageUnavailableException>(() => store.MigrateAsync(CancellationToken.None));
        await Assert.ThrowsAsync<StorageUnavailableException>(() => store.PingAsync(CancellationToken.None));
    }

    [Fact]
    public async Task AFileThatIsNotADatabaseIsStorageUnavailable()
    {
        await File.WriteAllBytesAsync(Path.Combine(root, StorageOptions.SqliteFileName), Enumerable.Repeat((byte)0x5A, 4096).ToArray());
        await using var store = new PartwiseStorage(new StorageOptions { DataDirectory = root });

        var error = await Assert.ThrowsAsync<StorageUnavailableException>(() => store.MigrateAsync(CancellationToken.None));
        Assert.NotNull(error.InnerException);
    }

    [Fact]
    public async Task AnUnreachablePostgresServerIsStorageUnavailable()
    {
        // Port 1 on loopback: connection refused at once.
        await using var store = new PartwiseStorage(new StorageOptions { PostgresConnectionString = "Host=127.0.0.1;Port=1;Database=partwise;Timeout=3" });

        await Assert.ThrowsAsync<StorageUnavailableException>(() => store.MigrateAsync(CancellationToken.None));
        await Assert.ThrowsAsync<StorageUnavailableException>(() => store.PingAsync(CancellationToken.None));
        await Assert.ThrowsAsync<StorageUnavailableException>(() => store.Flags.ListAsync(new FlagQuery(), CancellationToken.None));
        await Assert.ThrowsAsync<StorageUnavailableException>(() => store.Baselines.CreateAsync("wells-north", _ => "{}", CancellationToken.None));
        await Assert.ThrowsAsync<StorageUnavailableException>(() =>
            store.Flags.WaitForChangeAsync(new ChangeToken("0", 0), TimeSpan.FromSeconds(1), CancellationToken.None));
    }
}
