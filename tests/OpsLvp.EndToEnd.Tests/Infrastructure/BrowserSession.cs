using Microsoft.Playwright;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>Playwright driving the machine's headless Chromium (never a downloaded browser).</summary>
public sealed class BrowserSession : IAsyncDisposable
{
    private static readonly string[] s_args =
    [
        "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update",
        "--disable-sync", "--no-first-run",
    ];

    private readonly IPlaywright _playwright;

    private BrowserSession(IPlaywright playwright, IBrowser browser)
    {
        _playwright = playwright;
        Browser = browser;
    }

    public IBrowser Browser { get; }

    public static async Task<BrowserSession> LaunchAsync()
    {
        var executable = ChromiumLocator.Require();
        var playwright = await Playwright.CreateAsync();
        try
        {
            var browser = await playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
            {
                ExecutablePath = executable,
                Headless = true,
                Args = s_args,
            });
            return new BrowserSession(playwright, browser);
        }
        catch
        {
            playwright.Dispose();
            throw;
        }
    }

    /// <summary>A fresh page at the wall's design size, 1920×1080.</summary>
    public async Task<IPage> NewWallPageAsync()
    {
        var context = await Browser.NewContextAsync(new BrowserNewContextOptions
        {
            ViewportSize = new ViewportSize { Width = 1920, Height = 1080 },
            Locale = "en-GB",
        });
        return await context.NewPageAsync();
    }

    public async ValueTask DisposeAsync()
    {
        await Browser.DisposeAsync();
        _playwright.Dispose();
    }
}
