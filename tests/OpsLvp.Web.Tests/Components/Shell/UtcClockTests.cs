using Bunit;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Web.Components.Shell;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Components.Shell;

/// <summary>The app bar clock on a fake clock. Times are invented test values.</summary>
public sealed class UtcClockTests : BunitContext
{
    private readonly FakeTimeProvider _real = new(new DateTimeOffset(2030, 6, 1, 12, 0, 0, TimeSpan.Zero));

    [Fact]
    public void ShowsUtcWithZ_AndTicksEachSecond()
    {
        var clock = new FakeTimeProvider(new DateTimeOffset(2026, 1, 15, 4, 30, 0, TimeSpan.FromHours(1)));
        Services.AddSingleton<TimeProvider>(clock);
        Services.AddSingleton(new DemoMode(false, 30));

        var cut = Render<UtcClock>();
        Assert.Equal("2026-01-15 03:30:00Z", cut.Find("[data-testid=utc-clock]").TextContent);

        clock.Advance(TimeSpan.FromSeconds(1));
        cut.WaitForAssertion(() => Assert.Equal("2026-01-15 03:30:01Z", cut.Find("[data-testid=utc-clock]").TextContent));
        Assert.Equal("UTC", cut.Find("[data-testid=utc-clock]").GetAttribute("title"));
    }

    [Fact]
    public void InDemoMode_ShowsDemoTime_RefreshingOncePerRealSecond()
    {
        var demo = new AcceleratedTimeProvider(_real, new DateTimeOffset(2026, 1, 15, 2, 0, 0, TimeSpan.Zero), 30);
        Services.AddSingleton<TimeProvider>(demo);
        Services.AddSingleton(new DemoMode(true, 30));

        var cut = Render<UtcClock>();
        _real.Advance(TimeSpan.FromSeconds(1));

        cut.WaitForAssertion(() => Assert.Equal("2026-01-15 02:00:30Z", cut.Find("[data-testid=utc-clock]").TextContent));
        Assert.Equal("Demo time (UTC)", cut.Find("[data-testid=utc-clock]").GetAttribute("title"));
    }
}
