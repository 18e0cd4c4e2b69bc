using System.Net;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.FaultCases;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Pages a visitor sees before signing in carry no live alarms or operational data (issue 12).</summary>
public sealed class AnonymousPagesTests
{
    /// <summary>Every page a visitor can reach without signing in, error pages included.</summary>
    private static readonly string[] AnonymousPaths = ["/", "/signin", "/signout", "/setup", "/not-found", "/no-such-page", "/Error"];

    [Fact]
    public async Task AnonymousPages_RenderNoAlarmStrip()
    {
        await using var app = AccessApp.Start();
        using var visitor = AccessClient.For(app);

        foreach (var path in AnonymousPaths)
        {
            using var response = await visitor.GetAsync(path);
            var html = await response.Content.ReadAsStringAsync();

            Assert.True(response.StatusCode is HttpStatusCode.OK or HttpStatusCode.NotFound, $"{path} answered {(int)response.StatusCode}");
            Assert.DoesNotContain("data-testid=\"alarm-strip\"", html, StringComparison.Ordinal);
            Assert.DoesNotContain("Alarms unavailable", html, StringComparison.Ordinal);
        }
    }

    [Fact]
    public async Task SignedInPerson_StillSeesTheAlarmStrip()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("v.test", Web.Commands.Roles.Viewer);
        using var person = AccessClient.For(app);
        (await person.SignInAsync("v.test", AccessApp.Password)).Dispose();

        using var response = await person.GetAsync("/");

        Assert.Contains("data-testid=\"alarm-strip\"", await response.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }

    /// <summary>
    /// A real storage fault: the data folder is a small tmpfs, filled up until a push is refused with 503, so the
    /// server is not recording (docs/reliability.md "Storage faults"). The "NOT RECORDING since …" banner, its storage
    /// error, the live heartbeat and the alarm strip are operational data: a signed-in viewer sees the banner, a visitor
    /// sees none of them on any page. Readings are invented.
    /// </summary>
    [RootFact]
    public async Task WhileNotRecording_AnonymousPagesShowNoBannerHeartbeatOrAlarms_ButASignedInPageShowsTheBanner()
    {
        using var fs = SmallMount.Mount(OpsLvpApp.NewDataFolder(), 24);
        var settings = LiveTestProfile.Settings(LiveTestProfile.Write(fs.Root));
        await using var app = AccessApp.Start(settings, fs.Root);
        await app.CreateUserAsync("v.test", Web.Commands.Roles.Viewer);
        using var person = AccessClient.For(app);
        (await person.SignInAsync("v.test", AccessApp.Password)).Dispose();
        Assert.True(person.HasCookie(Web.Access.AccessSchemes.SessionCookieName), "the viewer did not sign in");

        fs.Fill();
        var t = DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-60).ToUnixTimeMilliseconds());
        var refused = false;
        for (var i = 0; i < 600 && !refused; i++)
        {
            refused = await PushAsync(app, t = t.AddMilliseconds(100)) == HttpStatusCode.ServiceUnavailable;
        }
        Assert.True(refused, "the full data folder never made a push fail");
        var live = app.Services.GetRequiredService<ILiveState>();
        var deadline = DateTime.UtcNow.AddSeconds(30);
        while (live.Current?.Recording is not { Recording: false })
        {
            Assert.True(DateTime.UtcNow < deadline, "the live state did not say 'not recording' within 30 s of a refused push");
            await Task.Delay(100);
        }

        using var signedIn = await person.GetAsync("/");
        var signedInHtml = WebUtility.HtmlDecode(await signedIn.Content.ReadAsStringAsync());
        Assert.Equal(HttpStatusCode.OK, signedIn.StatusCode);
        Assert.Contains("data-testid=\"not-recording\"", signedInHtml, StringComparison.Ordinal);
        Assert.Contains("NOT RECORDING since", signedInHtml, StringComparison.Ordinal);
        Assert.Contains("data-testid=\"heartbeat\"", signedInHtml, StringComparison.Ordinal);
        // the storage error as the banner shows it (the live state's reason can move on between reads: both are checked below)
        var detail = System.Text.RegularExpressions.Regex.Match(signedInHtml, "opslvp-not-recording-detail\"[^>]*>([^<]*)</span>").Groups[1].Value;
        var shownReason = detail.Replace("Readings are refused and actions are not applied; values shown are the last recorded. ", "", StringComparison.Ordinal).Trim();
        Assert.True(shownReason.Length > 0, $"the banner names no storage error: '{detail}'");

        using var visitor = AccessClient.For(app);
        foreach (var path in AnonymousPaths)
        {
            using var response = await visitor.GetAsync(path);
            var html = WebUtility.HtmlDecode(await response.Content.ReadAsStringAsync());

            Assert.True(response.StatusCode is HttpStatusCode.OK or HttpStatusCode.NotFound, $"{path} answered {(int)response.StatusCode}");
            Assert.True(html.Contains("</html>", StringComparison.Ordinal), $"{path} did not render a whole page");
            Assert.False(html.Contains("data-testid=\"not-recording\"", StringComparison.Ordinal), $"{path} shows the not-recording banner");
            Assert.False(html.Contains("NOT RECORDING", StringComparison.Ordinal), $"{path} says NOT RECORDING");
            Assert.False(html.Contains(shownReason, StringComparison.Ordinal), $"{path} shows the storage error");
            if (live.Current?.Recording?.Reason is { Length: > 0 } reason)
            {
                Assert.False(html.Contains(reason, StringComparison.Ordinal), $"{path} shows the storage error");
            }
            Assert.False(html.Contains("data-testid=\"heartbeat\"", StringComparison.Ordinal), $"{path} carries the live heartbeat");
            Assert.False(html.Contains("data-testid=\"no-live-banner\"", StringComparison.Ordinal), $"{path} carries the no-live-data banner");
            Assert.False(html.Contains("data-testid=\"alarm-strip\"", StringComparison.Ordinal), $"{path} shows the alarm strip");
        }
    }

    private static async Task<HttpStatusCode> PushAsync(OpsLvpApp app, DateTimeOffset t)
    {
        var items = string.Join(",", Enumerable.Range(0, 50).Select(i => LiveClient.Item(t.AddMilliseconds(i), LiveTestProfile.Tdz, "rvr", 1500 + i)));
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + items + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        return response.StatusCode;
    }
}
