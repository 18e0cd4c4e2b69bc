namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>One server and one browser shared by a test class whose tests do not interfere (xunit class fixture).</summary>
public sealed class SharedServer : IAsyncLifetime
{
    private OpsLvpServer? _server;
    private BrowserSession? _browser;

    public OpsLvpServer Server => _server ?? throw new InvalidOperationException("the shared server is not started");

    public BrowserSession Browser => _browser ?? throw new InvalidOperationException("the shared browser is not started");

    public async Task InitializeAsync()
    {
        if (ChromiumLocator.SkipReason is not null)
        {
            return; // every test of the class is skipped
        }
        _browser = await BrowserSession.LaunchAsync();
        _server = await OpsLvpServer.StartAsync();
    }

    public async Task DisposeAsync()
    {
        if (_server is not null)
        {
            await _server.DisposeAsync();
        }
        if (_browser is not null)
        {
            await _browser.DisposeAsync();
        }
    }
}
