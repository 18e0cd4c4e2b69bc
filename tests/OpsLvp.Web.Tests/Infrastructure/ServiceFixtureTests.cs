using Npgsql;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>The throwaway servers the tests start for themselves really run, and are what the app needs.</summary>
public sealed class ServiceFixtureTests
{
    [PostgresFact]
    public async Task PostgresCluster_GivesEachTestItsOwnDatabase_WithDurableCommits()
    {
        var first = PostgresCluster.Shared.CreateDatabase();
        var second = PostgresCluster.Shared.CreateDatabase();
        Assert.NotEqual(new NpgsqlConnectionStringBuilder(first).Database, new NpgsqlConnectionStringBuilder(second).Database);

        await using var connection = new NpgsqlConnection(first);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT current_setting('fsync'), current_setting('synchronous_commit'), current_setting('listen_addresses')", connection);
        await using var reader = await command.ExecuteReaderAsync();
        Assert.True(await reader.ReadAsync());
        Assert.Equal("on", reader.GetString(0));
        Assert.Equal("on", reader.GetString(1));
        Assert.Equal("127.0.0.1", reader.GetString(2));
    }

    [RedisFact]
    public async Task RedisServer_StartsOnAFreePort_AndStopsWhenDisposed()
    {
        int port;
        using (var redis = await RedisServerProcess.StartAsync())
        {
            port = redis.Port;
            Assert.Equal("+OK", await redis.CommandAsync("SET opslvp-test invented"));
            Assert.Equal("+PONG", await redis.CommandAsync("PING"));
        }

        using var client = new System.Net.Sockets.TcpClient();
        await Assert.ThrowsAnyAsync<System.Net.Sockets.SocketException>(() => client.ConnectAsync("127.0.0.1", port));
    }
}
