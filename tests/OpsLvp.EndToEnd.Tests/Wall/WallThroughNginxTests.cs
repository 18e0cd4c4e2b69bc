using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Wall;

/// <summary>
/// The wall in a real Chromium THROUGH a real nginx running the repository's configuration for docker-compose's profile
/// <c>ha</c> (docs/deployment.md): the display link, the page, the Blazor circuit's WebSocket and the live updates all
/// pass through nginx. Readings invented; the thresholds they cross are the test profile's illustrative values.
/// </summary>
public sealed class WallThroughNginxTests
{
    private const string PhaseTitle = "[data-testid=wall-phase-title]";

    [BrowserNginxFact]
    public async Task TheWall_OpenedThroughNginx_UpdatesLive_OverAWebSocketThroughNginx()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartAsync();
        // The file's upstream has two servers; both are this one node here (one database, one display link). The
        // two-node version, where the wall comes back live after its node is killed, is Cluster/WallFailoverThroughNginxTests.
        using var nginx = await NginxProcess.StartAsync([server.BaseAddress, server.BaseAddress]);
        var page = await browser.NewWallPageAsync();

        var link = await server.Accounts.IssueDisplayLinkAsync("e2e wall through nginx (invented)");
        var response = await page.GotoAsync(new Uri(nginx.BaseAddress, link).ToString());
        Assert.True(response is { Ok: true }, $"GET {link} through nginx answered {response?.Status}; nginx: {nginx.ErrorLog()}");
        await Expect(page).ToHaveURLAsync(new Uri(nginx.BaseAddress, "/wall").ToString());
        await WallBrowserTests.WaitUntilLiveAsync(page);

        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 1500), (Mid, "rvr", 1500), (End, "rvr", 1500), (Ceilometer, "cloud_base", 1000));
        await Expect(page.Locator(PhaseTitle)).ToHaveTextAsync("NORMAL OPERATIONS", new() { Timeout = 30_000 });
        await page.EvaluateAsync("() => { window.__opslvpSamePage = true; }");

        // 400 m < active.rvrBelowM 550 m with an enter dwell of 0 s (invented test profile): straight to LVP in force.
        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 400), (Mid, "rvr", 450), (End, "rvr", 500), (Ceilometer, "cloud_base", 1000));
        await Expect(page.Locator(PhaseTitle)).ToHaveTextAsync("LVP IN FORCE", new() { Timeout = 30_000 });
        Assert.True(await page.EvaluateAsync<bool>("() => window.__opslvpSamePage === true"), "the page was reloaded");
        browser.AssertNoCspViolationOrUncaughtError();

        // The circuit ran over a WebSocket through nginx (its log line is written when it closes).
        await page.CloseAsync();
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (!nginx.AccessLog().Any(l => l.Status == 101 && l.Request.StartsWith("GET /_blazor?id=", StringComparison.Ordinal)))
        {
            Assert.True(DateTime.UtcNow < deadline, "no WebSocket upgrade (101) of /_blazor in nginx's access log: " + string.Join(" | ", nginx.AccessLog().Select(l => $"{l.Status} {l.Request}")));
            await Task.Delay(200);
        }
        Assert.Contains(nginx.AccessLog(), l => l.Request.StartsWith("GET /wall", StringComparison.Ordinal) && l.Status == 200);
    }
}
