using Microsoft.Extensions.DependencyInjection;
using Npgsql;
using OpsLvp.Data;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Real app nodes (Kestrel on 127.0.0.1) of one installation on one database of the throwaway PostgreSQL cluster
/// (<see cref="PostgresLeadership"/> elects the leader), optionally on one throwaway redis-server for fan-out and
/// commands between nodes. It owns what it starts: the nodes (<see cref="Start"/>), the leadership lock the test may
/// hold itself (<see cref="HoldLeadershipAsync"/>), the redis-server, the database and the folder of the profile and
/// anchor key the nodes share; disposing it stops and removes them, nodes first. The profile is the invented live test
/// profile.
/// </summary>
public sealed class PostgresNodes : IAsyncDisposable
{
    private readonly List<OpsLvpApp> _apps = [];
    private readonly Dictionary<string, string?> _settings;
    private NpgsqlConnection? _holder;

    private PostgresNodes(ProviderDatabase db, string shared, RedisServerProcess? redis, IDictionary<string, string?>? settings)
    {
        Db = db;
        Shared = shared;
        Redis = redis;
        Profile = LiveTestProfile.Write(shared);
        _settings = new Dictionary<string, string?>(settings ?? new Dictionary<string, string?>());
    }

    public ProviderDatabase Db { get; }

    /// <summary>The folder every node shares: profile, anchor key, anchor logs.</summary>
    public string Shared { get; }

    /// <summary>The live test profile's file (invented).</summary>
    public string Profile { get; }

    /// <summary>The redis-server every node uses, or null without one (or once <see cref="StopRedis"/> has stopped it).</summary>
    public RedisServerProcess? Redis { get; private set; }

    /// <summary>
    /// A new database, shared folder and, with <paramref name="redis"/>, a redis-server; <paramref name="settings"/> are
    /// given to every node started (over <see cref="TwoNodeLeadershipTests.Settings"/>).
    /// </summary>
    public static async Task<PostgresNodes> CreateAsync(IDictionary<string, string?>? settings = null, bool redis = false)
    {
        var db = ProviderDatabase.Create(OpsLvpDatabase.PostgresProvider);
        var shared = OpsLvpApp.NewDataFolder();
        RedisServerProcess? server = null;
        try
        {
            Directory.CreateDirectory(shared);
            server = redis ? await RedisServerProcess.StartAsync() : null;
            return new PostgresNodes(db, shared, server, settings);
        }
        catch
        {
            server?.Dispose();
            db.Dispose();
            OpsLvpApp.TryDelete(shared);
            throw;
        }
    }

    /// <summary>Node <paramref name="node"/>'s settings: the installation's, then <paramref name="extra"/>.</summary>
    public Dictionary<string, string?> Settings(string node, IDictionary<string, string?>? extra = null)
    {
        var settings = TwoNodeLeadershipTests.Settings(Db, Profile, Shared, node);
        if (Redis is not null)
        {
            settings["Cluster:Redis"] = Redis.Configuration;
        }
        foreach (var (key, value) in _settings.Concat(extra ?? new Dictionary<string, string?>()))
        {
            settings[key] = value;
        }
        return settings;
    }

    /// <summary>Starts node <paramref name="node"/>; it is stopped when this is disposed.</summary>
    public OpsLvpApp Start(string node, IDictionary<string, string?>? extra = null)
    {
        var app = OpsLvpApp.Start(Settings(node, extra));
        _apps.Add(app);
        return app;
    }

    /// <summary>Starts node-a then node-b and returns which leads (restored) and which stands by.</summary>
    public Task<(OpsLvpApp Leader, OpsLvpApp Standby)> StartTwoAsync(IDictionary<string, string?>? extra = null)
    {
        var first = Start("node-a", extra);
        var second = Start("node-b", extra);
        return LeaderAndStandbyAsync(first, second);
    }

    /// <summary>The node that leads (restored) and the other, waiting generously: on a loaded machine either may win.</summary>
    public static async Task<(OpsLvpApp Leader, OpsLvpApp Standby)> LeaderAndStandbyAsync(OpsLvpApp first, OpsLvpApp second)
    {
        var one = first.Services.GetRequiredService<ILeadership>();
        var two = second.Services.GetRequiredService<ILeadership>();
        await Eventually.TrueAsync(() => one.IsLeader != two.IsLeader, "exactly one node to lead", TimeSpan.FromSeconds(60));
        var (leader, standby) = one.IsLeader ? (first, second) : (second, first);
        var host = leader.Services.GetRequiredService<LiveEngineHost>();
        await Eventually.TrueAsync(() => host.State is not null, "the leader to restore", TimeSpan.FromSeconds(60));
        Assert.True(standby.Services.GetRequiredService<LiveEngineHost>().IsStandby);
        return (leader, standby);
    }

    /// <summary>The leader is absent: the test holds the leadership lock itself, as a node that froze would.</summary>
    public async Task HoldLeadershipAsync()
    {
        Assert.Null(_holder);
        var holder = new NpgsqlConnection(Db.ConnectionString + ";Pooling=false");
        _holder = holder;
        await holder.OpenAsync();
        await using var take = new NpgsqlCommand($"SELECT pg_try_advisory_lock({PostgresLeadership.LockKey})", holder);
        Assert.True((bool)(await take.ExecuteScalarAsync())!);
    }

    /// <summary>Frees the lock <see cref="HoldLeadershipAsync"/> took (its session ends), so a node can lead.</summary>
    public async Task ReleaseLeadershipAsync()
    {
        if (_holder is { } holder)
        {
            _holder = null;
            await holder.DisposeAsync();
        }
    }

    /// <summary>Kills this test's own redis-server: every node loses its connection to it.</summary>
    public void StopRedis()
    {
        Redis?.Dispose();
        Redis = null;
    }

    /// <summary>Runs <paramref name="sql"/> on the database, on a connection of its own.</summary>
    public async Task ExecuteAsync(string sql)
    {
        await using var connection = new NpgsqlConnection(Db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync();
    }

    public Task<long> InboxCountAsync() => InboxCountAsync(Db);

    public Task WaitInboxEmptyAsync() => WaitInboxEmptyAsync(Db);

    /// <summary>The ids of the batches waiting in the reading inbox, oldest first.</summary>
    public Task<List<long>> InboxIdsAsync() => InboxIdsAsync(Db);

    /// <summary>The ids of the batches waiting in the reading inbox of <paramref name="db"/>, oldest first.</summary>
    public static async Task<List<long>> InboxIdsAsync(ProviderDatabase db)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT id FROM reading_inbox ORDER BY id", connection);
        var ids = new List<long>();
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            ids.Add(reader.GetInt64(0));
        }
        return ids;
    }

    /// <summary>How many batches wait in the reading inbox of <paramref name="db"/>.</summary>
    public static async Task<long> InboxCountAsync(ProviderDatabase db)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT count(*) FROM reading_inbox", connection);
        return (long)(await command.ExecuteScalarAsync())!;
    }

    /// <summary>Polls until the reading inbox of <paramref name="db"/> is empty; fails after 60 s saying how many wait.</summary>
    public static async Task WaitInboxEmptyAsync(ProviderDatabase db)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(60);
        long waiting;
        while ((waiting = await InboxCountAsync(db)) > 0)
        {
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"{waiting} batch(es) still wait in the reading inbox after 60 s");
            }
            await Task.Delay(50);
        }
    }

    public async ValueTask DisposeAsync()
    {
        var errors = new List<Exception>();
        for (var i = _apps.Count - 1; i >= 0; i--)
        {
            try
            {
                await _apps[i].DisposeAsync();
            }
            catch (Exception ex)
            {
                errors.Add(ex);
            }
        }
        _apps.Clear();
        try
        {
            await ReleaseLeadershipAsync();
        }
        catch (Exception ex)
        {
            errors.Add(ex);
        }
        StopRedis();
        Db.Dispose();
        OpsLvpApp.TryDelete(Shared);
        if (errors.Count > 0)
        {
            throw new AggregateException("stopping the nodes failed", errors);
        }
    }
}
