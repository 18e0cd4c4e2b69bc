using System.Net;
using System.Text.Json;
using Microsoft.Playwright;
using Npgsql;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Screens;

/// <summary>
/// The reading inbox's two alarms (docs/engine.md R81 "readings from other nodes waiting", R82 "reading batch set
/// aside") produced for real — two OpsLvp processes on one throwaway PostgreSQL database, a CHECK constraint the test adds
/// refusing one invented value — and looked at on the wall, the duty console and the team page at the four screen sizes
/// of docs/screens.md, in LVP preparation with open items: both alarms said in full, inside the screen and not cut off,
/// the phase in view and not covered, the wall's text large enough, every control big enough for a finger on the touch
/// sizes (<see cref="ScreenMeasure"/>). Readings, people and items are the invented test profile's.
/// </summary>
public sealed class InboxAlarmScreensBrowserTests(ITestOutputHelper output)
{
    /// <summary>An invented RVR value (inside the profile's range, so the standby accepts it) that the test's constraint refuses.</summary>
    private const double Refused = 4321;

    private const string BehindKey = "inbox-behind";

    private const string SetAsideKey = "inbox-batch-set-aside";

    private static readonly TimeSpan s_generous = TimeSpan.FromSeconds(90); // two nodes and a browser on a shared 2-core machine

    [BrowserPostgresFact]
    public async Task InboxBehindAndBatchSetAside_AreSaidInFullOnEveryScreenAtEverySize_WithThePhaseInView()
    {
        var connectionString = PostgresCluster.Shared.CreateDatabase();
        var anchors = Directory.CreateTempSubdirectory("opslvp-e2e-anchors-").FullName;
        await using var accounts = TestAccounts.OpenPostgres(connectionString);
        await accounts.SeedStandardAsync();
        await using var browser = await BrowserSession.LaunchAsync();
        await using var leader = await OpsLvpServer.StartNodeAsync(accounts, NodeSettings("node-1", connectionString, anchors));
        await WaitForLeaderAsync(leader);
        await using var standby = await OpsLvpServer.StartNodeAsync(accounts, NodeSettings("node-2", connectionString, anchors));

        // Only the leader raises the alarms; without Redis its screens are the ones that show them.
        var wall = await browser.NewWallPageAsync();
        await Wall.WallBrowserTests.OpenLiveWallAsync(wall, leader);
        var console = await browser.NewPageAsync(1440, 900, touch: true);
        await BrowserAccess.SignInAsync(console, leader, TestAccounts.Manager, "/console");
        var tablet = await browser.NewPageAsync(1024, 768, touch: true);
        await BrowserAccess.SignInAsync(tablet, leader, TestAccounts.Apron, "/actions");

        // Below the preparation threshold (1000 m, invented): LVP preparation, the apron team's "prep-works" open.
        await leader.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
        await Expect(tablet.Locator("[data-testid=actions-phase]")).ToHaveTextAsync("LVP PREPARATION", new() { Timeout = 30_000 });
        await Expect(tablet.Locator("[data-testid=action-item][data-item-id=prep-works]")).ToHaveAttributeAsync("data-status", "open", new() { Timeout = 30_000 });
        await ExecuteAsync(connectionString, $"ALTER TABLE readings ADD CONSTRAINT invented_fault CHECK (value IS DISTINCT FROM {Refused})");

        // A refused batch through the standby; each later push wakes the leader for one more attempt until it sets it aside.
        await PushToStandbyAsync(standby, Refused);
        await WakeUntilAsync(console, SetAsideKey, standby);
        // the batches behind it are taken: the behind alarm (raised while it waited) goes
        await Expect(console.Locator($"[data-testid=alarm][data-alarm-key={BehindKey}]")).ToHaveCountAsync(0, new() { Timeout = 60_000 });
        // Another refused batch: left at the head (the attempts are far apart), older than Cluster:InboxAlarmAfter.
        await PushToStandbyAsync(standby, Refused);
        await Task.Delay(TimeSpan.FromSeconds(1.5)); // older than Cluster:InboxAlarmAfter (1 s) before the next wake
        await WakeUntilAsync(console, BehindKey, standby);

        var problems = new List<string>();
        // what must be in view: the kind and the message's first words (a long message is cut behind "Show all")
        var alarmTexts = new (string Selector, string Words)[]
        {
            ($"[data-testid=alarm][data-alarm-key={BehindKey}]", "READINGS FROM OTHER NODES WAITING|reading batch(es) pushed to other nodes|since "),
            ($"[data-testid=alarm][data-alarm-key={SetAsideKey}]", "READING BATCH SET ASIDE|reading batch 1 received|since "),
        };
        var wallTexts = new (string Selector, string Words)[]
        {
            ($"[data-testid=wall-alarm][data-key={BehindKey}]", "READINGS FROM OTHER NODES WAITING|reading batch(es) pushed to other nodes|since "),
            ($"[data-testid=wall-alarm][data-key={SetAsideKey}]", "READING BATCH SET ASIDE|reading batch 1 received|full text on the console"),
        };
        foreach (var size in ScreenMeasure.Sizes)
        {
            var touch = size.Width <= 1024;
            await ScreenMeasure.ShowAtAsync(wall, size, $"inbox-wall-page-at-{size.Name}.png", output);
            problems.AddRange(await ScreenMeasure.ProblemsAsync(wall, $"wall page at {size.Name}", "[data-testid=wall-phase]", wallTexts, wall: size.Name == "wall", touch, [.. wallTexts.Select(t => t.Selector)]));
            await ScreenMeasure.ShowAtAsync(console, size, $"inbox-console-page-at-{size.Name}.png", output);
            problems.AddRange(await ScreenMeasure.ProblemsAsync(console, $"console page at {size.Name}", "[data-testid=console-phase]", alarmTexts, wall: false, touch, [.. alarmTexts.Select(t => t.Selector)]));
            await ScreenMeasure.ShowAtAsync(tablet, size, $"inbox-team-page-at-{size.Name}.png", output);
            problems.AddRange(await ScreenMeasure.ProblemsAsync(tablet, $"team page at {size.Name}", "[data-testid=actions-phase]", alarmTexts, wall: false, touch, [.. alarmTexts.Select(t => t.Selector)]));
        }
        // "Show all" on a phone gives the whole message, nothing of it cut off, the phase still in view
        var setAside = tablet.Locator($"[data-testid=alarm][data-alarm-key={SetAsideKey}]");
        await setAside.Locator("[data-testid=alarm-more]").TapAsync();
        await Expect(setAside.Locator("[data-testid=alarm-more]")).ToHaveTextAsync("Show less");
        await ScreenMeasure.ShowAtAsync(tablet, ScreenMeasure.Sizes[^1], "inbox-team-page-at-phone-show-all.png", output);
        problems.AddRange(await ScreenMeasure.ProblemsAsync(tablet, "team page at phone, set-aside alarm shown in full", "[data-testid=actions-phase]",
            [($"[data-testid=alarm][data-alarm-key={SetAsideKey}]", "was set aside and will not be evaluated|invented_fault|its content is in the audit entry inbox_batch_set_aside")], wall: false, touch: true));
        output.WriteLine("leader's log:\n" + leader.Output);
        Assert.True(problems.Count == 0, string.Join(Environment.NewLine, problems));
        // the behind alarm stood throughout: the pictures show both
        await Expect(console.Locator($"[data-testid=alarm][data-alarm-key={BehindKey}]")).ToHaveCountAsync(1);
        browser.AssertNoCspViolationOrUncaughtError();
    }

    /// <summary>Pushes a reading batch to the standby (into the inbox) every 2 s until <paramref name="alarmKey"/> is on <paramref name="page"/>.</summary>
    private static async Task WakeUntilAsync(IPage page, string alarmKey, OpsLvpServer standby)
    {
        var alarm = page.Locator($"[data-testid=alarm][data-alarm-key={alarmKey}]");
        var deadline = DateTime.UtcNow + s_generous;
        while (await alarm.CountAsync() == 0)
        {
            Assert.True(DateTime.UtcNow < deadline, $"the alarm {alarmKey} did not show within {s_generous.TotalSeconds} s");
            // invented, keeps preparation
            await PushToStandbyAsync(standby, 900);
            try
            {
                await Expect(alarm).ToHaveCountAsync(1, new() { Timeout = 2_000 });
            }
            catch (PlaywrightException)
            {
                // not yet: one more wake
            }
        }
    }

    private static async Task PushToStandbyAsync(OpsLvpServer standby, double tdz)
    {
        var (status, text) = await standby.TryPushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", tdz));
        Assert.True(status == HttpStatusCode.Accepted, $"the standby answered {(int)status}: {text}");
    }

    private static async Task WaitForLeaderAsync(OpsLvpServer node)
    {
        var deadline = DateTime.UtcNow + s_generous;
        while (true)
        {
            try
            {
                using var response = await node.Client.GetAsync(new Uri("/health", UriKind.Relative));
                using var health = JsonDocument.Parse(await response.Content.ReadAsStringAsync());
                if (health.RootElement.GetProperty("engine").GetProperty("running").GetBoolean())
                {
                    return;
                }
            }
            catch (Exception ex) when (ex is HttpRequestException or TaskCanceledException or JsonException or KeyNotFoundException)
            {
                // not answering yet
            }
            Assert.True(DateTime.UtcNow < deadline, "node-1 did not lead within 90 s:\n" + node.Output);
            await Task.Delay(200);
        }
    }

    private static async Task ExecuteAsync(string connectionString, string sql)
    {
        await using var connection = new NpgsqlConnection(new NpgsqlConnectionStringBuilder(connectionString) { Pooling = false }.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync();
    }

    private static Dictionary<string, string> NodeSettings(string node, string connectionString, string anchors) => new()
    {
        ["OpsLvp__Database__Provider"] = "Postgres",
        ["ConnectionStrings__OpsLvp"] = connectionString,
        ["Cluster__NodeId"] = node,
        ["Cluster__LeaderRetryInterval"] = "00:00:00.500",
        // R81, R82 quickly: the behind alarm after 1 s; a failing head batch set aside at its sixth attempt, and the
        // attempts a minute apart unless a push wakes the leader, so the second refused batch stays while the test looks
        ["Cluster__InboxAlarmAfter"] = "00:00:01",
        ["Cluster__InboxSetAsideAfter"] = "6",
        ["Cluster__InboxPollInterval"] = "00:01:00",
        ["Anchors__KeyPath"] = Path.Combine(anchors, "anchor-key.pem"),
        ["Anchors__LogPath"] = Path.Combine(anchors, $"anchors-{node}.jsonl"),
    };
}
