using System.Data.Common;
using Microsoft.EntityFrameworkCore.Diagnostics;
using OpsLvp.Data;

namespace OpsLvp.Benchmarks.Audit;

/// <summary>
/// The product's connection pragmas (<see cref="SqlitePragmaInterceptor"/>) with <c>synchronous</c> chosen, so the
/// same store can be measured under NORMAL. The benchmarks use the product's own interceptor for FULL.
/// </summary>
public sealed class BenchPragmaInterceptor(SyncMode sync) : DbConnectionInterceptor
{
    public string Sql { get; } = PragmaSql(sync);

    public static string PragmaSql(SyncMode sync) =>
        $"PRAGMA journal_mode=WAL; PRAGMA synchronous={sync.ToString().ToUpperInvariant()}; PRAGMA busy_timeout={SqlitePragmaInterceptor.DefaultBusyTimeoutMs}; PRAGMA foreign_keys=ON;";

    public override void ConnectionOpened(DbConnection connection, ConnectionEndEventData eventData)
    {
        using var command = connection.CreateCommand();
        command.CommandText = Sql;
        command.ExecuteNonQuery();
    }

    public override async Task ConnectionOpenedAsync(DbConnection connection, ConnectionEndEventData eventData, CancellationToken cancellationToken = default)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = Sql;
        await command.ExecuteNonQueryAsync(cancellationToken);
    }
}
