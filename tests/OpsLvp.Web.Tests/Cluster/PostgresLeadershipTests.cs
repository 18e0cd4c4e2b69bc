using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Options;
using Npgsql;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Leadership and fencing on a real PostgreSQL (a throwaway cluster; docs/engine.md R70–R72, docs/deployment.md
/// "PostgreSQL and several nodes"): two nodes, exactly one leads; a takeover increments the epoch; an append with
/// a stale epoch is refused and writes nothing while the new leader's succeeds. Audit entries are invented.
/// </summary>
public sealed class PostgresLeadershipTests
{
    private static readonly DateTimeOffset s_t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [PostgresFact]
    public async Task TwoNodes_ExactlyOneLeads_AndATakeoverIncrementsTheEpoch()
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(OpsLvpDatabase.PostgresProvider);
        using var a = Node(db, "node-a");
        using var b = Node(db, "node-b");

        var aLeads = await a.TryAcquireAsync(CancellationToken.None);
        var bLeads = await b.TryAcquireAsync(CancellationToken.None);
        // b tries again: the lock is a's as long as a's session lives
        bLeads |= await b.TryAcquireAsync(CancellationToken.None);

        Assert.True(aLeads);
        Assert.False(bLeads);
        Assert.True(a.IsLeader);
        Assert.False(b.IsLeader);
        Assert.Equal(1, a.Epoch);
        Assert.Equal(0, b.Epoch);
        Assert.Equal((1L, "node-a"), await LeadershipRowAsync(db));

        var changes = new List<bool>();
        a.LeadershipChanged += changes.Add;
        a.StepDown("test: a gives up");
        Assert.False(a.IsLeader);
        Assert.Equal([false], changes);
        // a's session is closed; PostgreSQL releases its lock when that backend has ended, a moment later on a loaded
        // machine, so b tries until it wins (as its election loop would) instead of once
        var bTook = false;
        await Eventually.TrueAsync(() => bTook = bTook || b.TryAcquireAsync(CancellationToken.None).GetAwaiter().GetResult(),
            "b to take the lock a gave up", TimeSpan.FromSeconds(30));
        Assert.False(await a.TryAcquireAsync(CancellationToken.None));

        Assert.True(b.IsLeader);
        Assert.Equal(2, b.Epoch);
        Assert.Equal((2L, "node-b"), await LeadershipRowAsync(db));
    }

    [PostgresFact]
    public async Task StaleEpochAppend_IsRefused_AndWritesNothing_WhileTheNewLeadersAppendSucceeds()
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(OpsLvpDatabase.PostgresProvider);
        using var a = Node(db, "node-a");
        using var b = Node(db, "node-b");
        using var storeA = new AuditStore(db.NewFactory());
        using var storeB = new AuditStore(db.NewFactory());
        Assert.True(await a.TryAcquireAsync(CancellationToken.None));
        var epochA = a.Epoch;
        await storeA.AppendFencedAsync([Entry("a-1")], State("a-1"), epochA);

        // b takes over while a still believes it leads (a's session is cut, as a network cut would)
        await KillLeadershipSessionAsync(db, "node-a");
        Assert.True(await b.TryAcquireAsync(CancellationToken.None));
        var headBefore = await storeA.GetHeadAsync();
        var stateBefore = await storeA.GetLatestStateAsync();

        var refused = await Assert.ThrowsAsync<StaleEpochException>(() => storeA.AppendFencedAsync([Entry("a-2"), Entry("a-3")], State("a-2"), epochA));

        Assert.Equal(epochA, refused.Epoch);
        Assert.Equal(b.Epoch, refused.Current);
        Assert.Equal(headBefore!.Sequence, (await storeA.GetHeadAsync())!.Sequence);
        Assert.Equal(stateBefore!.StateJson, (await storeA.GetLatestStateAsync())!.StateJson);
        Assert.Equal(stateBefore.AuditSequence, (await storeA.GetLatestStateAsync())!.AuditSequence);

        var committed = await storeB.AppendFencedAsync([Entry("b-1")], State("b-1"), b.Epoch);

        Assert.Equal(headBefore.Sequence + 1, Assert.Single(committed).Sequence);
        Assert.Contains("b-1", (await storeB.GetLatestStateAsync())!.StateJson, StringComparison.Ordinal);
        var verification = await storeB.VerifyAsync();
        Assert.True(verification.Ok, verification.Detail);
        var all = await storeB.GetRangeAsync(1, long.MaxValue);
        Assert.DoesNotContain(all, e => e.PayloadJson.Contains("a-2", StringComparison.Ordinal) || e.PayloadJson.Contains("a-3", StringComparison.Ordinal));
        // a's own loop (which has not run yet) sees its session gone and steps down
        Assert.True(a.IsLeader);
        using var stop = new CancellationTokenSource();
        var loop = a.RunAsync(stop.Token);
        await Eventually.TrueAsync(() => !a.IsLeader, "the old leader to step down", TimeSpan.FromSeconds(60));
        Assert.False(loop.IsCompleted);
        await stop.CancelAsync();
        await loop;
        Assert.True(b.IsLeader);
    }

    [PostgresFact]
    public async Task Append_WithAnEpochBeforeAnyLeader_IsRefused()
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(OpsLvpDatabase.PostgresProvider);
        using var store = new AuditStore(db.NewFactory());

        var refused = await Assert.ThrowsAsync<StaleEpochException>(() => store.AppendFencedAsync([Entry("x")], State("x"), 1));

        Assert.Null(refused.Current);
        Assert.Null(await store.GetHeadAsync());
        // unfenced appends (accounts, keys: any node) still work
        Assert.Single(await store.AppendAsync([Entry("y")]));
    }

    internal static PostgresLeadership Node(ProviderDatabase db, string nodeId, TimeSpan? interval = null) =>
        new(db.NewFactory(), Options.Create(new ClusterOptions { NodeId = nodeId, LeaderRetryInterval = interval ?? TimeSpan.FromMilliseconds(200) }), TimeProvider.System, NullLogger<PostgresLeadership>.Instance);

    /// <summary>
    /// Ends the leadership session of <paramref name="nodeId"/> server-side (<c>pg_terminate_backend</c>), as a cut network
    /// or a killed process does; only in this test's database (tests running at once on the shared cluster use the same node names).
    /// </summary>
    internal static async Task<int> KillLeadershipSessionAsync(ProviderDatabase db, string nodeId)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT count(pg_terminate_backend(pid)) FROM pg_stat_activity WHERE application_name = @name AND datname = current_database()", connection);
        command.Parameters.AddWithValue("name", PostgresLeadership.ApplicationNamePrefix + nodeId);
        return Convert.ToInt32(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }

    private static async Task<(long Epoch, string NodeId)> LeadershipRowAsync(ProviderDatabase db)
    {
        await using var context = db.Factory.CreateDbContext();
        var row = await context.EngineLeadership.AsNoTracking().SingleAsync();
        return (row.Epoch, row.NodeId);
    }

    private static NewAuditEntry Entry(string mark) => new("test", "leadership.test", $"{{\"mark\":\"{mark}\"}}", s_t0);

    private static EngineStateWrite State(string mark) => new($"{{\"mark\":\"{mark}\"}}", "invented-profile-1", s_t0);
}
