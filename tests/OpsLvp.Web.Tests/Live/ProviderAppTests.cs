using System.Net;
using System.Text.Json;
using System.Threading.Channels;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Access;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Live;

/// <summary>
/// The real app on Kestrel over each provider (a SQLite file, or a database of the test PostgreSQL cluster): push
/// ingest through the engine to the hub, restart with the engine state restored, and a session that works on a
/// second app with another data folder on the same database (keys in the database). Readings are invented.
/// </summary>
public sealed class ProviderAppTests
{
    private const string Sqlite = OpsLvpDatabase.SqliteProvider;
    private const string Postgres = OpsLvpDatabase.PostgresProvider;

    [Fact]
    public Task PushedReading_IsStored_Evaluated_AndReachesTheHub_Sqlite() => PushedReading_IsStored_Evaluated_AndReachesTheHub(Sqlite);

    [PostgresFact]
    public Task PushedReading_IsStored_Evaluated_AndReachesTheHub_Postgres() => PushedReading_IsStored_Evaluated_AndReachesTheHub(Postgres);

    [Fact]
    public Task Restart_RestoresTheEngineState_AndContinuesTheChain_Sqlite() => Restart_RestoresTheEngineState_AndContinuesTheChain(Sqlite);

    [PostgresFact]
    public Task Restart_RestoresTheEngineState_AndContinuesTheChain_Postgres() => Restart_RestoresTheEngineState_AndContinuesTheChain(Postgres);

    [Fact]
    public Task Session_WorksOnASecondAppOnTheSameDatabase_Sqlite() => Session_WorksOnASecondAppOnTheSameDatabase(Sqlite);

    [PostgresFact]
    public Task Session_WorksOnASecondAppOnTheSameDatabase_Postgres() => Session_WorksOnASecondAppOnTheSameDatabase(Postgres);

    private static async Task PushedReading_IsStored_Evaluated_AndReachesTheHub(string provider)
    {
        using var db = ProviderDatabase.Create(provider);
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            await using var app = OpsLvpApp.Start(Settings(db, folder), folder);
            var states = Channel.CreateUnbounded<JsonElement>();
            var readerKey = await LiveClient.ReaderKeyAsync(app);
            await using var hub = new HubConnectionBuilder().WithUrl(new Uri(app.BaseAddress, "/hubs/lvp"), o => o.Headers[OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header] = readerKey).Build();
            hub.On<JsonElement>("state", s => states.Writer.TryWrite(s));
            await hub.StartAsync();

            // 900 m < preparation.rvrBelow 1000 m, enter dwell 0 s (invented test profile)
            var sent = DateTimeOffset.UtcNow;
            await LiveClient.PushAsync(app, LiveClient.Item(sent, LiveTestProfile.Tdz, "rvr", 900));
            var pushed = await NextAsync(states, s => LiveClient.Phase(s) == "preparation");

            Assert.Equal(900, pushed.GetProperty("status").GetProperty("governingRvr").GetProperty("value").GetDouble());
            Assert.Equal("preparation", LiveClient.Phase(await LiveClient.StateAsync(app)));
            // stored in the configured database (read here through a factory of its own, not the app's)
            using var readings = new ReadingStore(db.NewFactory());
            var rows = await readings.GetReceivedAsync(sent.AddHours(-1), sent.AddHours(1));
            Assert.Contains(rows, r => r.Sensor == LiveTestProfile.Tdz && r.Accepted && r.Value == 900 && r.Source == "push:live-test");
            using var audit = new AuditStore(db.NewFactory());
            var verification = await audit.VerifyAsync();
            Assert.True(verification.Ok, verification.Detail);
            var entries = await audit.GetRangeAsync(1, long.MaxValue);
            Assert.Contains(entries, e => e.PayloadJson.Contains("preparation", StringComparison.Ordinal));
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task Restart_RestoresTheEngineState_AndContinuesTheChain(string provider)
    {
        using var db = ProviderDatabase.Create(provider);
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            long headBefore;
            await using (var first = OpsLvpApp.Start(Settings(db, folder), folder))
            {
                await LiveClient.PushAsync(first, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));
                await LiveClient.WaitForPhaseAsync(first, "preparation", TimeSpan.FromSeconds(60));
                headBefore = (await LiveClient.Audit(first).GetHeadAsync())!.Sequence;
            }

            await using var second = OpsLvpApp.Start(Settings(db, folder), folder);
            await LiveClient.WaitForPhaseAsync(second, "preparation", TimeSpan.FromSeconds(60));

            var entries = await LiveClient.EntriesAsync(second);
            Assert.True(entries[^1].Sequence > headBefore);
            var starts = entries.Where(e => e.Kind == "engine_started").ToList();
            Assert.Equal(2, starts.Count);
            Assert.Contains("\"restored\":true", starts[1].PayloadJson, StringComparison.Ordinal);
            await LiveClient.AssertChainVerifiesAsync(second);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task Session_WorksOnASecondAppOnTheSameDatabase(string provider)
    {
        using var db = ProviderDatabase.Create(provider);
        var settings = db.AppSettings;
        settings["Access:SetupSecret"] = AccessApp.SetupSecret;
        settings["Access:SignInPerAddressPerMinute"] = "1000";
        settings["Access:SignInAttemptsPerAccount"] = "1000";
        settings["Access:SignInAttemptsPerAccountAllAddresses"] = "1000";
        // one installation, one anchor key (docs/audit.md "Anchors"): the engine state row is sealed with it, and a node
        // with another key would rightly refuse the state; the key and log sit outside both data folders
        var anchors = Directory.CreateDirectory(OpsLvpApp.NewDataFolder()).FullName;
        settings["Anchors:KeyPath"] = Path.Combine(anchors, "anchor-key.pem");
        settings["Anchors:LogPath"] = Path.Combine(anchors, "anchors.jsonl");

        await using var first = OpsLvpApp.Start(settings);
        await first.CreateUserAsync("v.nodes", Roles.Viewer);
        using var person = AccessClient.For(first);
        (await person.SignInAsync("v.nodes", AccessApp.Password)).Dispose();
        var session = person.Cookies.GetAllCookies().Single(c => c.Name == Web.Access.AccessSchemes.SessionCookieName);
        await using (var keys = db.Factory.CreateDbContext())
        {
            Assert.NotEmpty(await keys.DataProtectionKeys.AsNoTracking().ToListAsync());
        }

        // a second app with a data folder of its own (as a second node or a re-created container has)
        await using var second = OpsLvpApp.Start(settings);
        Assert.NotEqual(first.DataFolder, second.DataFolder);
        using var copy = new HttpClient(new HttpClientHandler { UseCookies = false, AllowAutoRedirect = false }) { BaseAddress = second.BaseAddress };
        copy.DefaultRequestHeaders.Add("Cookie", $"{session.Name}={session.Value}");
        // on PostgreSQL the second app is a standby node (docs/engine.md R70) and has no live state of its own to show
        // until the fan-out is in; the review list needs a signed-in account on any node
        using var signedIn = await copy.GetAsync(new Uri(provider == Postgres ? "/api/episodes" : "/api/state", UriKind.Relative));
        using var anonymous = await second.Client.GetAsync(new Uri("/api/state", UriKind.Relative));

        Assert.Equal(HttpStatusCode.OK, signedIn.StatusCode);
        Assert.Equal(HttpStatusCode.Unauthorized, anonymous.StatusCode);
    }

    private static Dictionary<string, string?> Settings(ProviderDatabase db, string folder)
    {
        var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
        foreach (var (key, value) in db.AppSettings)
        {
            settings[key] = value;
        }
        return settings;
    }

    private static Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match) =>
        StateChannels.NextAsync(states, match);
}
