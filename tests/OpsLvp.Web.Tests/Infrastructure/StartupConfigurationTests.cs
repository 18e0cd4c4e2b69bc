using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>Bad configuration stops the app at start with a message naming the setting (STYLE.md, Options).</summary>
public sealed class StartupConfigurationTests
{
    private static string StartFailure(Dictionary<string, string?> settings)
    {
        var ex = Assert.ThrowsAny<Exception>(() => OpsLvpApp.Start(settings));
        var validation = ex as OptionsValidationException ?? ex.InnerException as OptionsValidationException
            ?? (ex as AggregateException)?.InnerExceptions.OfType<OptionsValidationException>().FirstOrDefault();
        Assert.NotNull(validation);
        return validation.Message;
    }

    [Fact]
    public void HttpFeedWithRelativeUrl_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Feeds:Http:0:Name"] = "a", ["Feeds:Http:0:Url"] = "/readings" });

        Assert.Contains("Feeds:Http:0:Url must be an absolute http or https URL (got '/readings').", message, StringComparison.Ordinal);
    }

    [Fact]
    public void ShortPushKey_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Feeds:Push:ApiKeys:0:Name"] = "a", ["Feeds:Push:ApiKeys:0:Key"] = "short" });

        Assert.Contains("Feeds:Push:ApiKeys:0:Key must be at least 16 characters.", message, StringComparison.Ordinal);
    }

    [Fact]
    public void DemoSpeedZero_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Demo:Speed"] = "0" });

        Assert.Contains("Demo:Speed must be between 1 and 3600.", message, StringComparison.Ordinal);
    }

    [Fact]
    public void ReadingsCoverIntervalZero_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Engine:ReadingsCoverInterval"] = "00:00:00" });

        Assert.Contains("Engine:ReadingsCoverInterval must be between 00:00:01 and 1.00:00:00", message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("Cluster:InboxMaxBatches", "0", "Cluster:InboxMaxBatches must be between 1 and 1000000")]
    [InlineData("Cluster:InboxMaxBatches", "1000001", "Cluster:InboxMaxBatches must be between 1 and 1000000")]
    [InlineData("Cluster:InboxAlarmAfter", "00:00:00.5", "Cluster:InboxAlarmAfter must be between 00:00:01 and 01:00:00")]
    [InlineData("Cluster:InboxAlarmAfter", "02:00:00", "Cluster:InboxAlarmAfter must be between 00:00:01 and 01:00:00")]
    [InlineData("Cluster:InboxSetAsideAfter", "0", "Cluster:InboxSetAsideAfter must be between 1 and 100")]
    [InlineData("Cluster:InboxSetAsideAfter", "101", "Cluster:InboxSetAsideAfter must be between 1 and 100")]
    public void ReadingInboxSettingOutOfRange_StopsStart_NamingTheSetting(string setting, string value, string expected)
    {
        var message = StartFailure(new() { [setting] = value });

        Assert.Contains(expected, message, StringComparison.Ordinal);
    }

    [Fact]
    public void MissingAssetsFolder_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Assets:Folder"] = "no-such-assets-folder" });

        Assert.Contains("Assets:Folder", message, StringComparison.Ordinal);
        Assert.Contains("no-such-assets-folder' does not exist.", message, StringComparison.Ordinal);
    }

    [Fact]
    public void PushKeyGivenAsAPlainListValue_StopsStart_NamingTheSetting()
    {
        // The shape an operator once used for a bootstrap key; the binder used to skip it without a word.
        var message = StartFailure(new() { ["Feeds:Push:ApiKeys:0"] = "bootstrap-key-0123456789" });

        Assert.Contains("Feeds:Push:ApiKeys:0 must be a section with its own settings (Feeds:Push:ApiKeys:0:Name, Feeds:Push:ApiKeys:0:Key), not a single value.", message, StringComparison.Ordinal);
    }

    [Fact]
    public void SingleValueGivenAsASection_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Engine:TickInterval:Seconds"] = "1" });

        Assert.Contains("Engine:TickInterval must be a single value, not a section (found Engine:TickInterval:Seconds).", message, StringComparison.Ordinal);
    }
}
