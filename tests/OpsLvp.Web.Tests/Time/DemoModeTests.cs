using OpsLvp.Web.Feeds;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Time;

public sealed class DemoModeTests
{
    private static FeedsOptions NoFeeds() => new();

    [Fact]
    public void Auto_WithNoRealFeed_IsDemo()
    {
        var mode = TimeServiceCollectionExtensions.Decide(new DemoOptions { Speed = 45 }, NoFeeds());

        Assert.Equal(new DemoMode(true, 45), mode);
        Assert.Equal("DEMO ×45", mode.BadgeText);
    }

    [Fact]
    public void Auto_WithAnHttpFeed_IsNotDemo()
    {
        var feeds = new FeedsOptions { Http = [new HttpFeedOptions { Name = "a", Url = "http://127.0.0.1:1/" }] };

        var mode = TimeServiceCollectionExtensions.Decide(new DemoOptions(), feeds);

        Assert.False(mode.Enabled);
        Assert.Null(mode.BadgeText);
    }

    [Fact]
    public void Auto_WithAPushKey_IsNotDemo()
    {
        var feeds = new FeedsOptions { Push = new PushIngestOptions { ApiKeys = [new PushApiKey { Name = "a", Key = "0123456789abcdef" }] } };

        Assert.False(TimeServiceCollectionExtensions.Decide(new DemoOptions(), feeds).Enabled);
    }

    [Fact]
    public void OnAndOff_OverrideTheFeedRule()
    {
        var feeds = new FeedsOptions { Http = [new HttpFeedOptions { Name = "a", Url = "http://127.0.0.1:1/" }] };

        Assert.True(TimeServiceCollectionExtensions.Decide(new DemoOptions { Simulator = SimulatorMode.On }, feeds).Enabled);
        Assert.False(TimeServiceCollectionExtensions.Decide(new DemoOptions { Simulator = SimulatorMode.Off }, NoFeeds()).Enabled);
    }

    [Fact]
    public void BadgeText_ShowsFractionalSpeedInvariantly()
    {
        Assert.Equal("DEMO ×2.5", new DemoMode(true, 2.5).BadgeText);
    }
}
