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
    public void MissingAssetsFolder_StopsStart_NamingTheSetting()
    {
        var message = StartFailure(new() { ["Assets:Folder"] = "no-such-assets-folder" });

        Assert.Contains("Assets:Folder", message, StringComparison.Ordinal);
        Assert.Contains("no-such-assets-folder' does not exist.", message, StringComparison.Ordinal);
    }
}
