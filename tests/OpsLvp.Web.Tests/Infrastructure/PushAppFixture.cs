namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>One running app with a push key configured and a small body limit, shared by the push ingest tests.</summary>
public sealed class PushAppFixture : IAsyncLifetime
{
    /// <summary>Invented test key.</summary>
    public const string Key = "test-key-0123456789abcdef";

    public const int MaxBodyBytes = 4096;

    public OpsLvpApp App { get; private set; } = null!;

    public Task InitializeAsync()
    {
        App = OpsLvpApp.Start(new Dictionary<string, string?>
        {
            ["Feeds:Push:ApiKeys:0:Name"] = "station-a",
            ["Feeds:Push:ApiKeys:0:Key"] = Key,
            ["Engine:Enabled"] = "false", // the push tests read the pipeline themselves
            ["Feeds:Push:MaxBodyBytes"] = MaxBodyBytes.ToString(System.Globalization.CultureInfo.InvariantCulture),
        });
        return Task.CompletedTask;
    }

    public async Task DisposeAsync() => await App.DisposeAsync();
}
