using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Text.Json;
using Microsoft.Playwright;
using Npgsql;
using OpsLvp.Core.Presentation;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Cluster;

/// <summary>
/// Issue 16 in a real Chromium: two OpsLvp server processes on one throwaway PostgreSQL database and one throwaway
/// redis-server, behind a real nginx running the repository's configuration for docker-compose's profile <c>ha</c>
/// (docs/deployment.md "Several nodes with docker compose"). The wall, opened with a display link, keeps its promise when
/// its node is killed with SIGKILL (the leader, or the standby): it says it is not live, comes back by itself through
/// nginx from the surviving node, still signed in, and shows a phase change pushed there. A tick on a tablet served by
/// the standby is applied once by the leader. Kill-to-live times are printed, not asserted (generous ceilings).
/// Readings, people and items are the invented test profile's.
/// </summary>
public sealed class WallFailoverThroughNginxTests(ITestOutputHelper output)
{
    private const string PhaseTitle = "[data-testid=wall-phase-title]";

    /// <summary>nginx's sticky cookie (src/OpsLvp.Web/deploy/nginx/opslvp-ha.conf): the node is a hash of its value.</summary>
    private const string NodeCookie = "opslvp_node";

    private const string WallClient = "wall";
    private const string TabletClient = "tablet";

    private static readonly TimeSpan s_generous = TimeSpan.FromSeconds(90); // two nodes, a browser and nginx on a shared 2-core machine

    private static string Preparation => LvpVocabulary.Of(LvpState.Preparation).Headline;

    private static string InForce => LvpVocabulary.Of(LvpState.InForce).Headline;

    [BrowserClusterFact]
    public Task WallOnTheLeader_LeaderKilled_WallComesBackLiveFromTheOtherNode_AndATickOnTheStandbyIsAppliedOnce() =>
        RunAsync(killTheLeader: true);

    // The other case: the wall and the tablet on the standby, which is killed; the leader carries on, so no takeover.
    [BrowserClusterFact]
    public Task WallOnTheStandby_StandbyKilled_WallAndTabletComeBackLiveFromTheLeader_TheTickStillAppliedOnce() =>
        RunAsync(killTheLeader: false);

    /// <summary>
    /// Wall on the leader (<paramref name="killTheLeader"/>) or on the standby, tablet on the standby; ticks one item
    /// there, then kills the wall's node with SIGKILL and follows what the wall shows until it shows, live, a phase
    /// change pushed to the surviving node.
    /// </summary>
    private async Task RunAsync(bool killTheLeader)
    {
        var connectionString = PostgresCluster.Shared.CreateDatabase();
        using var redis = await RedisServerProcess.StartAsync();
        var anchors = Directory.CreateTempSubdirectory("opslvp-e2e-anchors-").FullName;
        await using var accounts = TestAccounts.OpenPostgres(connectionString);
        await accounts.SeedStandardAsync();
        await using var browser = await BrowserSession.LaunchAsync();
        OpsLvpServer? leader = null;
        OpsLvpServer? standby = null;
        NginxProcess? nginx = null;
        try
        {
            // One at a time: the first creates the installation's anchor key, and leads, before the second starts.
            leader = await OpsLvpServer.StartNodeAsync(accounts, NodeSettings("node-1", connectionString, redis, anchors));
            Assert.True(await WaitForEngineAsync(leader, running: true, after: null, s_generous), "node-1 did not lead within 90 s:\n" + leader.Output);
            standby = await OpsLvpServer.StartNodeAsync(accounts, NodeSettings("node-2", connectionString, redis, anchors));
            Assert.False(await EngineRunningAsync(standby), "node-2 runs the engine while node-1 leads");
            nginx = await NginxProcess.StartAsync([leader.BaseAddress, standby.BaseAddress]);

            // nginx's own cookie decides the node; choose values that send the wall to the leader and the tablet to the standby.
            var keys = await CookieKeysAsync(nginx, [leader, standby]);

            // The wall, signed in by a display link, on the node to be killed.
            var (doomed, survivor) = killTheLeader ? (leader, standby) : (standby, leader);
            var wall = await browser.NewWallPageAsync();
            await PinAsync(wall, nginx, keys[doomed], WallClient);
            var link = await accounts.IssueDisplayLinkAsync("e2e wall failover (invented)");
            var response = await wall.GotoAsync(new Uri(nginx.BaseAddress, link).ToString());
            Assert.True(response is { Ok: true }, $"GET {link} through nginx answered {response?.Status}; nginx: {nginx.ErrorLog()}");
            await Expect(wall).ToHaveURLAsync(new Uri(nginx.BaseAddress, "/wall").ToString());
            await WaitUntilLiveAsync(wall);
            Assert.Equal(Address(doomed), LastNodeOf(nginx, WallClient, "GET /wall"));

            // A tablet of the apron team on the standby.
            var tablet = await browser.NewPageAsync(1024, 768, touch: true);
            await PinAsync(tablet, nginx, keys[standby], TabletClient);
            await SignInThroughAsync(tablet, nginx, TestAccounts.Apron, "/actions", standby);
            Assert.Equal([Address(standby)], NodesOf(nginx, TabletClient));

            // Below the preparation threshold (1000 m, invented): the apron team has "prep-works" open.
            await leader.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
            await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync(Preparation, new() { Timeout = 30_000 });
            await Expect(tablet.Locator("[data-testid=actions-phase]")).ToHaveTextAsync(Preparation, new() { Timeout = 30_000 });
            var wallItem = wall.Locator("[data-testid=wall-item][data-item=prep-works]");
            await Expect(wallItem).ToHaveCountAsync(1, new() { Timeout = 30_000 });

            // The tick on the standby's page goes to the leader (Redis) and is applied once.
            Assert.False(await EngineRunningAsync(standby), "the tablet's node leads: the tick would not cross nodes");
            var card = tablet.Locator("[data-item-id=prep-works]");
            await card.Locator("[data-testid=action-tick]").TapAsync();
            await tablet.Locator("[data-testid=action-confirm-yes]").TapAsync();
            await Expect(card).ToHaveAttributeAsync("data-status", "done", new() { Timeout = 30_000 });
            await Expect(wallItem).ToHaveCountAsync(0, new() { Timeout = 30_000 });
            Assert.Equal(1, await TicksOfAsync(connectionString, "prep-works"));
            browser.AssertNoCspViolationOrUncaughtError();

            // SIGKILL of the wall's node.
            // The page notes its own connection-state events in sessionStorage, which outlives a reload of the tab: a
            // banner shown and a reload done between two samples of this test are still seen.
            var browserKilledAt = await wall.EvaluateAsync<double>("""
                () => {
                  window.__opslvpBeforeKill = true;
                  sessionStorage.setItem('opslvp-e2e-states', '[]');
                  const banner = document.getElementById('components-reconnect-modal');
                  banner.addEventListener('components-reconnect-state-changed', e => {
                    const states = JSON.parse(sessionStorage.getItem('opslvp-e2e-states') || '[]');
                    states.push({ state: e.detail.state, at: Date.now(), open: banner.open });
                    sessionStorage.setItem('opslvp-e2e-states', JSON.stringify(states));
                  });
                  return Date.now();
                }
                """);
            var killedAt = DateTimeOffset.UtcNow;
            var clock = Stopwatch.StartNew();
            doomed.Kill();
            var killTook = clock.Elapsed;

            var samples = new List<WallSample>();
            TimeSpan? warned = null, tookOver = null, pushed = null, reloaded = null, live = null, shown = null;
            var warnedShot = Artifacts.PathFor($"wall-failover-{(killTheLeader ? "leader" : "standby")}-not-live.png");
            var warnedShotTaken = false;
            while (shown is null)
            {
                Assert.True(clock.Elapsed < TimeSpan.FromSeconds(120), "the wall did not show the new phase live within 120 s of the kill: " + Timeline(samples) + "\nsurviving node:\n" + survivor.Output + "\nnginx: " + nginx.ErrorLog());
                var sample = await SampleAsync(wall, clock.Elapsed);
                samples.Add(sample);
                warned ??= sample.Warns ? sample.At : null;
                if (!warnedShotTaken && sample.Warns && !sample.Navigating)
                {
                    warnedShotTaken = await TryScreenshotAsync(wall, warnedShot);
                }
                if (!sample.SamePage && sample.Title is not null && reloaded is null)
                {
                    reloaded = sample.At;
                }
                if (!sample.SamePage && sample.Title is not null && !sample.Warns && live is null)
                {
                    live = sample.At;
                }
                if (tookOver is null && await WaitForEngineAsync(survivor, running: true, after: killedAt, TimeSpan.Zero))
                {
                    tookOver = clock.Elapsed;
                }
                if (tookOver is not null && pushed is null)
                {
                    // 400 m < active.rvrBelowM 550 m, enter dwell 0 s (invented): LVP in force at once.
                    var (status, text) = await survivor.TryPushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 400), (Mid, "rvr", 450), (End, "rvr", 500), (Ceilometer, "cloud_base", 1000));
                    Assert.True(status is HttpStatusCode.Accepted or HttpStatusCode.OK or HttpStatusCode.ServiceUnavailable, $"POST /api/readings to the surviving node answered {(int)status}: {text}");
                    if (status != HttpStatusCode.ServiceUnavailable)
                    {
                        pushed = clock.Elapsed;
                    }
                }
                if (pushed is not null && !sample.SamePage && !sample.Warns && sample.Title == InForce)
                {
                    shown = sample.At;
                    break;
                }
                await Task.Delay(150);
            }
            var backShot = Artifacts.PathFor($"wall-failover-{(killTheLeader ? "leader" : "standby")}-back-live.png");
            await wall.ScreenshotAsync(new() { Path = backShot });

            output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"after the SIGKILL of the {(killTheLeader ? "leader" : "standby")} (the kill call took {killTook.TotalSeconds:0.0} s): warning on the wall {Ms(warned)}, the surviving node leads (evaluation after the kill) {Ms(tookOver)}, reading pushed to it {Ms(pushed)}, wall reloaded {Ms(reloaded)}, wall live without a warning {Ms(live)}, wall shows {InForce} {Ms(shown)}"));
            output.WriteLine("timeline: " + Timeline(samples));
            output.WriteLine($"screenshots: {(warnedShotTaken ? warnedShot : "(none while not live: the page was being replaced)")} {backShot}");
            output.WriteLine("wall requests through nginx: " + string.Join(" | ", nginx.AccessLog().Where(l => l.Client == WallClient).Select(l => $"{l.Upstream} {l.Status} {Shorten(l.Request)}")));
            output.WriteLine("browser console errors: " + string.Join(" | ", browser.ConsoleErrors));
            output.WriteLine("surviving node's cluster log: " + string.Join(Environment.NewLine, survivor.Output.Split(Environment.NewLine).Where(l => l.Contains("lead", StringComparison.OrdinalIgnoreCase) || l.Contains("NOT LIVE", StringComparison.Ordinal))));

            // What the operator saw: the connection banner over the old page soon after the kill (the page's own events),
            // and the old page never again without a warning (the samples).
            var states = await wall.EvaluateAsync<JsonElement>("() => JSON.parse(sessionStorage.getItem('opslvp-e2e-states') || '[]')");
            output.WriteLine("connection states of the old page: " + string.Join(", ", states.EnumerateArray().Select(e => string.Create(CultureInfo.InvariantCulture,
                $"{e.GetProperty("state").GetString()} at +{(e.GetProperty("at").GetDouble() - browserKilledAt) / 1000:0.0} s (banner {(e.GetProperty("open").GetBoolean() ? "shown" : "not shown")})"))));
            var first = states.EnumerateArray().FirstOrDefault();
            Assert.True(first.ValueKind == JsonValueKind.Object && first.GetProperty("state").GetString() == "show" && first.GetProperty("open").GetBoolean(),
                "the old page did not show its connection banner when its node died: " + states);
            var bannerAfter = TimeSpan.FromMilliseconds(first.GetProperty("at").GetDouble() - browserKilledAt);
            output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"connection banner shown {bannerAfter.TotalSeconds:0.0} s after the kill"));
            Assert.True(bannerAfter < TimeSpan.FromSeconds(30), $"the connection banner came {bannerAfter} after the kill");
            var bannerAt = warned is { } w && w < bannerAfter ? w : bannerAfter;
            var staleAsLive = samples.Where(s => s.At > bannerAt && s.SamePage && !s.Warns).ToList();
            Assert.True(staleAsLive.Count == 0, "after its node died the old page showed its last values without a warning: " + Timeline(staleAsLive));
            // It came back by itself, through nginx, from the surviving node, still signed in by its display link.
            Assert.NotNull(reloaded);
            await Expect(wall).ToHaveURLAsync(new Uri(nginx.BaseAddress, "/wall").ToString());
            Assert.Equal(Address(survivor), LastNodeOf(nginx, WallClient, "GET /wall"));
            await WaitUntilLiveAsync(wall);
            // The tick is still done and audited once; the tablet (on the surviving node all along, or reloaded onto it) agrees.
            await Expect(wallItem).ToHaveCountAsync(0);
            await Expect(tablet.Locator("[data-testid=actions-phase]")).ToHaveTextAsync(InForce, new() { Timeout = 60_000 });
            await Expect(card).ToHaveAttributeAsync("data-status", "done", new() { Timeout = 30_000 });
            Assert.Equal(Address(survivor), LastNodeOf(nginx, TabletClient, "GET /"));
            Assert.Equal(1, await TicksOfAsync(connectionString, "prep-works"));
        }
        finally
        {
            nginx?.Dispose();
            if (standby is not null)
            {
                await standby.DisposeAsync();
            }
            if (leader is not null)
            {
                await leader.DisposeAsync();
            }
            try
            {
                Directory.Delete(anchors, recursive: true);
            }
            catch (IOException)
            {
            }
            catch (UnauthorizedAccessException)
            {
            }
        }
    }

    private static Dictionary<string, string> NodeSettings(string node, string connectionString, RedisServerProcess redis, string anchors) => new()
    {
        ["OpsLvp__Database__Provider"] = "Postgres",
        ["ConnectionStrings__OpsLvp"] = connectionString,
        ["Cluster__NodeId"] = node,
        ["Cluster__Redis"] = redis.Configuration,
        // Short, so the test is quick: a standby tries for the lock every 0.5 s and says NOT LIVE after 3 s of silence.
        ["Cluster__LeaderRetryInterval"] = "00:00:00.500",
        ["Cluster__LeaderSilence"] = "00:00:03",
        // The installation's one anchor key (the sealed engine state verifies on either node); a log per node.
        ["Anchors__KeyPath"] = Path.Combine(anchors, "anchor-key.pem"),
        ["Anchors__LogPath"] = Path.Combine(anchors, $"anchors-{node}.jsonl"),
        ["Logging__LogLevel__OpsLvp.Web.Cluster"] = "Information",
    };

    /// <summary>For each node, a value of nginx's node cookie that nginx sends to it (tried through nginx, read back from its access log).</summary>
    private static async Task<Dictionary<OpsLvpServer, string>> CookieKeysAsync(NginxProcess nginx, IReadOnlyList<OpsLvpServer> nodes)
    {
        using var client = new HttpClient(new SocketsHttpHandler { UseCookies = false }) { BaseAddress = nginx.BaseAddress, Timeout = TimeSpan.FromSeconds(20) };
        var keys = new Dictionary<OpsLvpServer, string>();
        for (var i = 0; i < 64 && keys.Count < nodes.Count; i++)
        {
            var key = "e2e-" + Guid.NewGuid().ToString("N");
            using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/health", UriKind.Relative));
            request.Headers.Add("Cookie", $"{NodeCookie}={key}");
            request.Headers.Add(NginxProcess.ClientHeader, key);
            using var answer = await client.SendAsync(request);
            var node = await EventuallyAsync(() => nginx.AccessLog().LastOrDefault(l => l.Client == key)?.Upstream);
            if (nodes.FirstOrDefault(n => Address(n) == node) is { } served && !keys.ContainsKey(served))
            {
                keys[served] = key;
            }
        }
        Assert.True(keys.Count == nodes.Count, "nginx did not spread 64 cookie values over both nodes: " + string.Join(" | ", nginx.AccessLog().Select(l => l.Upstream)));
        return keys;
    }

    /// <summary>Gives <paramref name="page"/>'s browser context nginx's node cookie <paramref name="key"/>, and a header naming it in nginx's access log.</summary>
    private static async Task PinAsync(IPage page, NginxProcess nginx, string key, string client)
    {
        await page.Context.AddCookiesAsync([new Microsoft.Playwright.Cookie { Name = NodeCookie, Value = key, Url = nginx.BaseAddress.ToString() }]);
        await page.Context.SetExtraHTTPHeadersAsync(new Dictionary<string, string> { [NginxProcess.ClientHeader] = client });
    }

    private static async Task SignInThroughAsync(IPage page, NginxProcess nginx, string userName, string returnPath, OpsLvpServer node)
    {
        var response = await page.GotoAsync(new Uri(nginx.BaseAddress, "/signin?returnUrl=" + Uri.EscapeDataString(returnPath)).ToString());
        Assert.True(response is { Ok: true }, $"GET /signin through nginx answered {response?.Status}; nginx: {nginx.ErrorLog()}");
        await page.Locator("[data-testid=signin-user]").FillAsync(userName);
        await page.Locator("[data-testid=signin-password]").FillAsync(TestAccounts.Password);
        await page.Locator("[data-testid=signin-submit]").ClickAsync();
        try
        {
            await page.WaitForURLAsync(url => new Uri(url).AbsolutePath == returnPath, new() { Timeout = 45_000 });
        }
        catch (TimeoutException ex)
        {
            throw new TimeoutException($"sign-in as {userName} through nginx did not reach {returnPath} within 45 s; the page is at {page.Url}; node output:{Environment.NewLine}{node.Output}", ex);
        }
    }

    /// <summary>Waits until the wall's clock ticks, which only a live circuit does.</summary>
    private static async Task WaitUntilLiveAsync(IPage page)
    {
        const string clock = "[data-testid=wall-utc], .wall-nodata-clock";
        await page.Locator(clock).First.WaitForAsync(new() { Timeout = 30_000 });
        var first = await page.Locator(clock).First.TextContentAsync();
        await page.WaitForFunctionAsync(
            "([selector, first]) => { const e = document.querySelector(selector); return e !== null && e.textContent !== first; }",
            new object?[] { clock, first },
            new() { Timeout = 30_000 });
    }

    /// <summary>What the wall shows at one moment: its phase title, and whether any of the page's not-live signs is up.</summary>
    private sealed record WallSample(TimeSpan At, bool SamePage, string? Title, bool Banner, bool Disconnected, bool NoBeat, string? NotLive, bool Navigating)
    {
        /// <summary>The operator is told not to rely on the screen.</summary>
        public bool Warns => Banner || Disconnected || NoBeat || NotLive is not null;

        public override string ToString() => string.Create(CultureInfo.InvariantCulture,
            $"{At.TotalSeconds:0.0}s {(Navigating ? "loading" : $"{(SamePage ? "old" : "new")} page '{Title}'{(Banner ? " +connection banner" : "")}{(Disconnected ? " +disconnected" : "")}{(NoBeat ? " +no heartbeat" : "")}{(NotLive is null ? "" : $" +'{NotLive}'")}")}");
    }

    private static async Task<WallSample> SampleAsync(IPage page, TimeSpan at)
    {
        try
        {
            var s = await page.EvaluateAsync<JsonElement>("""
                () => {
                  const title = document.querySelector('[data-testid=wall-phase-title]');
                  const banner = document.getElementById('components-reconnect-modal');
                  const notLive = document.querySelector('[data-testid=not-recording]');
                  const html = document.documentElement.classList;
                  return {
                    same: window.__opslvpBeforeKill === true,
                    title: title === null ? null : title.textContent.trim(),
                    banner: banner !== null && banner.open === true,
                    disconnected: html.contains('opslvp-disconnected'),
                    noBeat: html.contains('opslvp-nolive'),
                    notLive: notLive === null ? null : notLive.querySelector('strong').textContent.trim(),
                  };
                }
                """);
            return new WallSample(at, s.GetProperty("same").GetBoolean(), s.GetProperty("title").GetString(), s.GetProperty("banner").GetBoolean(),
                s.GetProperty("disconnected").GetBoolean(), s.GetProperty("noBeat").GetBoolean(), s.GetProperty("notLive").GetString(), Navigating: false);
        }
        catch (PlaywrightException)
        {
            // the page is being replaced (its execution context went away mid-call)
            return new WallSample(at, false, null, false, false, false, null, Navigating: true);
        }
    }

    /// <summary>A screenshot, unless the page is being replaced meanwhile (the timeline still says what was shown).</summary>
    private static async Task<bool> TryScreenshotAsync(IPage page, string path)
    {
        try
        {
            await page.ScreenshotAsync(new() { Path = path, Timeout = 10_000 });
            return true;
        }
        catch (Exception ex) when (ex is PlaywrightException or TimeoutException)
        {
            return false;
        }
    }

    /// <summary>The samples, collapsed to the moments something changed.</summary>
    private static string Timeline(IEnumerable<WallSample> samples)
    {
        var changes = new List<WallSample>();
        foreach (var sample in samples)
        {
            if (changes.Count == 0 || changes[^1] with { At = sample.At } != sample)
            {
                changes.Add(sample);
            }
        }
        return string.Join(" → ", changes);
    }

    /// <summary>True once <paramref name="node"/>'s engine runs (or, with <paramref name="running"/> false, does not), with an evaluation after <paramref name="after"/> when given.</summary>
    private static async Task<bool> WaitForEngineAsync(OpsLvpServer node, bool running, DateTimeOffset? after, TimeSpan timeout)
    {
        var deadline = DateTime.UtcNow + timeout;
        while (true)
        {
            if (await EngineAsync(node) is { } engine && engine.Running == running && (after is null || engine.LastEvaluationAt > after))
            {
                return true;
            }
            if (DateTime.UtcNow >= deadline)
            {
                return false;
            }
            await Task.Delay(100);
        }
    }

    private static async Task<bool?> EngineRunningAsync(OpsLvpServer node) => (await EngineAsync(node))?.Running;

    /// <summary>The engine part of the node's <c>/health</c>, or null when it does not answer.</summary>
    private static async Task<(bool Running, DateTimeOffset? LastEvaluationAt)?> EngineAsync(OpsLvpServer node)
    {
        try
        {
            using var response = await node.Client.GetAsync(new Uri("/health", UriKind.Relative));
            using var health = JsonDocument.Parse(await response.Content.ReadAsStringAsync());
            var engine = health.RootElement.GetProperty("engine");
            var last = engine.TryGetProperty("lastEvaluationAt", out var at) && at.ValueKind == JsonValueKind.String ? at.GetDateTimeOffset() : (DateTimeOffset?)null;
            return (engine.GetProperty("running").GetBoolean(), last);
        }
        catch (Exception ex) when (ex is HttpRequestException or TaskCanceledException or JsonException or KeyNotFoundException)
        {
            return null;
        }
    }

    /// <summary>How many <c>item_ticked</c> audit entries name <paramref name="item"/>, read straight from PostgreSQL.</summary>
    private static async Task<long> TicksOfAsync(string connectionString, string item)
    {
        await using var connection = new NpgsqlConnection(new NpgsqlConnectionStringBuilder(connectionString) { Pooling = false }.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT count(*) FROM audit_entries WHERE kind = 'item_ticked' AND payload_json LIKE @item", connection);
        command.Parameters.AddWithValue("item", $"%\"{item}\"%");
        return (long)(await command.ExecuteScalarAsync())!;
    }

    private static string Address(OpsLvpServer node) => $"{node.BaseAddress.Host}:{node.BaseAddress.Port}";

    /// <summary>The node that finally answered the last request of <paramref name="client"/> starting with <paramref name="request"/> (nginx lists every node it tried).</summary>
    private static string? LastNodeOf(NginxProcess nginx, string client, string request) =>
        nginx.AccessLog().LastOrDefault(l => l.Client == client && l.Request.StartsWith(request, StringComparison.Ordinal))?.Upstream.Split(", ")[^1];

    private static string[] NodesOf(NginxProcess nginx, string client) =>
        [.. nginx.AccessLog().Where(l => l.Client == client).Select(l => l.Upstream.Split(", ")[^1]).Distinct()];

    private static async Task<string?> EventuallyAsync(Func<string?> read)
    {
        var deadline = DateTime.UtcNow.AddSeconds(30);
        while (read() is not { } value)
        {
            if (DateTime.UtcNow >= deadline)
            {
                return null;
            }
            await Task.Delay(50);
        }
        return read();
    }

    private static string Ms(TimeSpan? t) => t is { } v ? string.Create(CultureInfo.InvariantCulture, $"+{v.TotalSeconds:0.0} s") : "never";

    private static string Shorten(string request) => request.Length > 60 ? request[..60] + "…" : request;
}
