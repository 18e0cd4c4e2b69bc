using System.Net;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Pages a visitor sees before signing in carry no live alarms or operational data (issue 12).</summary>
public sealed class AnonymousPagesTests
{
    [Fact]
    public async Task AnonymousPages_RenderNoAlarmStrip()
    {
        await using var app = AccessApp.Start();
        using var visitor = AccessClient.For(app);

        foreach (var path in new[] { "/", "/signin", "/signout", "/setup", "/not-found", "/no-such-page" })
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
}
