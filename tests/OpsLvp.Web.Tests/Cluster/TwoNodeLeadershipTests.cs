using System.Net;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Two real apps (Kestrel on 127.0.0.1) on one database of a throwaway PostgreSQL cluster (docs/engine.md R70–R72):
/// exactly one evaluates; when the leader's leadership session is ended server-side (<c>pg_terminate_backend</c>, as
/// a cut network does) it steps down, the other restores the state and continues the chain, and the old leader
/// appends nothing more: readings pushed to it are handed over to the new leader (docs/engine.md R73, R74). Readings are invented (the live test profile).
/// </summary>
public sealed class TwoNodeLeadershipTests
{
    [PostgresFact]
    public async Task LeaderSessionKilled_ItStepsDown_TheOtherTakesOver_AndTheChainContinues()
    {
        using var db = ProviderDatabase.Create(OpsLvpDatabase.PostgresProvider);
        var shared = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(shared);
        try
        {
            var profile = LiveTestProfile.Write(shared);
            await using var first = OpsLvpApp.Start(Settings(db, profile, shared, "node-a"));
            await using var second = OpsLvpApp.Start(Settings(db, profile, shared, "node-b"));
            // the node started first normally leads from its start; on a loaded machine its first attempt can fail and
            // the other wins: either way exactly one leads. Below, a is the one that leads and b the standby.
            await Eventually.TrueAsync(
                () => first.Services.GetRequiredService<ILeadership>().IsLeader != second.Services.GetRequiredService<ILeadership>().IsLeader,
                "exactly one node to lead", TimeSpan.FromSeconds(60));
            var (a, b, nameA, nameB) = first.Services.GetRequiredService<ILeadership>().IsLeader
                ? (first, second, "node-a", "node-b")
                : (second, first, "node-b", "node-a");
            var leaderA = a.Services.GetRequiredService<ILeadership>();
            var leaderB = b.Services.GetRequiredService<ILeadership>();
            var hostA = a.Services.GetRequiredService<LiveEngineHost>();
            var hostB = b.Services.GetRequiredService<LiveEngineHost>();
            await Eventually.TrueAsync(() => hostA.State is not null, "the leader to restore", TimeSpan.FromSeconds(60));

            // a leads; b is a standby and evaluates nothing
            Assert.True(leaderA.IsLeader);
            Assert.False(leaderB.IsLeader);
            Assert.Equal(1, leaderA.Epoch);
            Assert.NotNull(hostA.State);
            Assert.Null(hostB.State);
            // a reading pushed to the standby is handed over to the leader through the inbox (docs/engine.md R73, R74)
            var handedOver = await PushAsync(b, DateTimeOffset.UtcNow, 700);
            Assert.Equal(HttpStatusCode.Accepted, handedOver.Status);
            await PostgresNodes.WaitInboxEmptyAsync(db);

            // 900 m < preparation.rvrBelow 1000 m, enter dwell 0 s (invented test profile)
            Assert.Equal(HttpStatusCode.Accepted, (await PushAsync(a, DateTimeOffset.UtcNow, 900)).Status);
            await LiveClient.WaitForPhaseAsync(a, "preparation", TimeSpan.FromSeconds(60));

            Assert.Equal(1, await PostgresLeadershipTests.KillLeadershipSessionAsync(db, nameA));

            await Eventually.TrueAsync(() => !leaderA.IsLeader, "node a to step down", TimeSpan.FromSeconds(60));
            await Eventually.TrueAsync(() => leaderB.IsLeader && hostB.State is not null, "node b to take over and restore", TimeSpan.FromSeconds(60));
            Assert.Equal(2, leaderB.Epoch);
            // restored from the database: the phase a committed
            Assert.Equal(OpsLvp.Core.Engine.Phase.Preparation, hostB.State!.Phase);
            await Eventually.TrueAsync(() => hostA.State is null, "node a to stop evaluating", TimeSpan.FromSeconds(60));

            // the old leader evaluates nothing any more: as a standby it hands its readings over to the new one
            var late = DateTimeOffset.UtcNow;
            Assert.Equal(HttpStatusCode.Accepted, (await PushAsync(a, late, 650)).Status);
            await PostgresNodes.WaitInboxEmptyAsync(db);
            Assert.Equal(HttpStatusCode.Accepted, (await PushAsync(b, late.AddSeconds(1), 800)).Status);

            using var readings = new ReadingStore(db.NewFactory());
            var rows = await readings.GetReceivedAsync(late.AddMinutes(-5), late.AddMinutes(5));
            // each stored once, accepted
            Assert.Single(rows, r => r.Value == 650 && r.Accepted);
            Assert.Single(rows, r => r.Value == 700 && r.Accepted);
            Assert.Single(rows, r => r.Value == 800 && r.Accepted);
            Assert.Equal(3, rows.Count(r => r.Value is 650 or 700 or 800));

            using var audit = new AuditStore(db.NewFactory());
            var verification = await audit.VerifyAsync();
            Assert.True(verification.Ok, verification.Detail);
            var entries = await audit.GetRangeAsync(1, long.MaxValue);
            // no sequence twice, none missing
            Assert.Equal(Enumerable.Range(1, entries.Count).Select(i => (long)i), entries.Select(e => e.Sequence));
            var taken = entries.Where(e => e.Kind == "leadership_taken").ToList();
            Assert.Equal(2, taken.Count);
            Assert.Contains(nameA, taken[0].PayloadJson, StringComparison.Ordinal);
            Assert.Contains(nameB, taken[1].PayloadJson, StringComparison.Ordinal);
        }
        finally
        {
            OpsLvpApp.TryDelete(shared);
        }
    }

    private static async Task<(HttpStatusCode Status, string Body)> PushAsync(OpsLvpApp app, DateTimeOffset time, double rvr)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + LiveClient.Item(time, LiveTestProfile.Tdz, "rvr", rvr) + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        return (response.StatusCode, await response.Content.ReadAsStringAsync());
    }

    internal static Dictionary<string, string?> Settings(ProviderDatabase db, string profile, string shared, string node)
    {
        var settings = LiveTestProfile.Settings(profile);
        foreach (var (key, value) in db.AppSettings)
        {
            settings[key] = value;
        }
        // one installation, one anchor key (docs/audit.md "Anchors"): both nodes seal and check the state with it
        settings["Anchors:KeyPath"] = Path.Combine(shared, "anchor-key.pem");
        settings["Anchors:LogPath"] = Path.Combine(shared, "anchors.jsonl");
        settings["Cluster:NodeId"] = node;
        settings["Cluster:LeaderRetryInterval"] = "00:00:00.2";
        return settings;
    }
}
