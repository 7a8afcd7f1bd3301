using System.Data.Common;
using System.Globalization;
using Partwise.Storage.Database;

namespace Partwise.Storage.Baselines;

/// <summary><see cref="IBaselineStore"/> on either provider.</summary>
internal sealed class SqlBaselineStore(StoreDatabase database) : IBaselineStore
{
    private const string Columns = "id, name, version, created_at, retired_at, document";

    public Task<BaselineRecord> CreateAsync(string name, Func<BaselineStamp, string> renderDocument, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(name);
        ArgumentNullException.ThrowIfNull(renderDocument);
        return database.WriteAsync<BaselineRecord>(async (connection, transaction, ct) =>
        {
            await using var next = connection.Command(
                transaction,
                """
                INSERT INTO baseline_names (name, last_version) VALUES (@name, 1)
                ON CONFLICT (name) DO UPDATE SET last_version = baseline_names.last_version + 1
                RETURNING last_version
                """);
            next.Add("@name", name);
            var version = (int)Convert.ToInt64(await next.ExecuteScalarAsync(ct), CultureInfo.InvariantCulture);

            var stamp = new BaselineStamp(StoreIds.New(), name, version, database.Now());
            var document = renderDocument(stamp);
            if (string.IsNullOrWhiteSpace(document))
            {
                throw new ArgumentException("The rendered baseline document is empty.", nameof(renderDocument));
            }

            await using var insert = connection.Command(
                transaction,
                "INSERT INTO baselines (id, name, version, created_at, document) VALUES (@id, @name, @version, @createdAt, @document)");
            insert.Add("@id", stamp.Id);
            insert.Add("@name", name);
            insert.Add("@version", (long)version);
            database.Dialect.AddTimestamp(insert, "@createdAt", stamp.CreatedAt);
            insert.Add("@document", document);
            await insert.ExecuteNonQueryAsync(ct);
            return (new BaselineRecord(stamp.Id, name, version, stamp.CreatedAt, null, document), true);
        }, cancellationToken);
    }

    public Task<BaselineRecord?> GetAsync(string id, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(id);
        return database.ReadAsync(async (connection, ct) =>
        {
            await using var select = connection.Command(null, $"SELECT {Columns} FROM baselines WHERE id = @id");
            select.Add("@id", id);
            await using var reader = await select.ExecuteReaderAsync(ct);
            return await reader.ReadAsync(ct) ? Read(reader) : null;
        }, cancellationToken);
    }

    public Task<IReadOnlyList<BaselineRecord>> ListAsync(bool activeOnly, CancellationToken cancellationToken) =>
        database.ReadAsync<IReadOnlyList<BaselineRecord>>(async (connection, ct) =>
        {
            var sql = activeOnly
                ? $"SELECT {Columns} FROM baselines WHERE retired_at IS NULL ORDER BY seq DESC"
                : $"SELECT {Columns} FROM baselines ORDER BY seq DESC";
            await using var select = connection.Command(null, sql);
            await using var reader = await select.ExecuteReaderAsync(ct);
            var list = new List<BaselineRecord>();
            while (await reader.ReadAsync(ct))
            {
                list.Add(Read(reader));
            }

            return list;
        }, cancellationToken);

    public Task<bool> RetireAsync(string id, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(id);
        return database.WriteAsync<bool>(async (connection, transaction, ct) =>
        {
            // Matches the row whether or not it was retired already; coalesce keeps the first retirement time.
            await using var update = connection.Command(
                transaction,
                "UPDATE baselines SET retired_at = coalesce(retired_at, @retiredAt) WHERE id = @id");
            update.Add("@id", id);
            database.Dialect.AddTimestamp(update, "@retiredAt", database.Now());
            var rows = await update.ExecuteNonQueryAsync(ct);
            return (rows == 1, rows == 1);
        }, cancellationToken);
    }

    private BaselineRecord Read(DbDataReader reader) => new(
        reader.GetString(0),
        reader.GetString(1),
        (int)reader.GetInt64(2),
        database.Dialect.ReadTimestamp(reader, 3),
        reader.IsDBNull(4) ? null : database.Dialect.ReadTimestamp(reader, 4),
        reader.GetString(5));
}
