using Microsoft.EntityFrameworkCore;
using Npgsql;
using OpsLvp.Data;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// A PostgreSQL session a node keeps for itself, outside the pool (the leadership lock's, the reading inbox's
/// <c>LISTEN</c>): the configured connection string with <see cref="NpgsqlConnectionStringBuilder.Pooling"/> off and
/// what the caller adds, opened, or disposed if opening fails.
/// </summary>
internal static class DedicatedSession
{
    public static async Task<NpgsqlConnection> OpenAsync(IDbContextFactory<OpsLvpDbContext> factory, Action<NpgsqlConnectionStringBuilder> configure, CancellationToken cancellationToken)
    {
        string connectionString;
        await using (var db = await factory.CreateDbContextAsync(cancellationToken))
        {
            connectionString = db.Database.GetConnectionString()
                ?? throw new InvalidOperationException("no PostgreSQL connection string is configured");
        }
        var builder = new NpgsqlConnectionStringBuilder(connectionString) { Pooling = false };
        configure(builder);
        var connection = new NpgsqlConnection(builder.ConnectionString);
        try
        {
            await connection.OpenAsync(cancellationToken);
        }
        catch
        {
            await connection.DisposeAsync();
            throw;
        }
        return connection;
    }
}
