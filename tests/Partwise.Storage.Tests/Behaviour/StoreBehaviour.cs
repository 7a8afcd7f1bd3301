using Partwise.Storage.Baselines;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Behaviour;

/// <summary>
/// The behaviour every provider must show, written once; each derived class supplies fresh, empty databases of its
/// provider. Each test gets its own database (xunit makes a new instance per test), already migrated, in
/// <see cref="Store"/>.
/// </summary>
public abstract partial class StoreBehaviour : IAsyncLifetime
{
    private readonly List<PartwiseStorage> opened = [];

    /// <summary>The store of this test, migrated.</summary>
    protected PartwiseStorage Store { get; private set; } = null!;

    /// <summary>The clock stamping the store's times.</summary>
    protected SteppingClock Clock { get; } = new();

    /// <summary>The options of <see cref="Store"/>'s database.</summary>
    protected StorageOptions Options { get; private set; } = null!;

    /// <summary>Options for a new, empty database of the provider (not migrated), cleaned up with the test.</summary>
    protected abstract Task<StorageOptions> FreshDatabaseAsync();

    /// <summary>Removes every database <see cref="FreshDatabaseAsync"/> made.</summary>
    protected abstract Task CleanUpAsync();

    /// <summary>Another store instance on <paramref name="options"/> (default: this test's database): another replica.</summary>
    protected PartwiseStorage Open(StorageOptions? options = null)
    {
        var store = new PartwiseStorage(options ?? Options, Clock);
        opened.Add(store);
        return store;
    }

    /// <summary>Creates a baseline through <see cref="Store"/>.</summary>
    protected Task<BaselineRecord> CreateBaselineAsync(string name = "wells-north") =>
        Store.Baselines.CreateAsync(name, Samples.Document, CancellationToken.None);

    /// <inheritdoc />
    public async Task InitializeAsync()
    {
        Options = await FreshDatabaseAsync();
        Store = Open();
        await Store.MigrateAsync(CancellationToken.None);
    }

    /// <inheritdoc />
    public async Task DisposeAsync()
    {
        foreach (var store in opened)
        {
            await store.DisposeAsync();
        }

        await CleanUpAsync();
    }
}
