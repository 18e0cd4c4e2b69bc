using System.Collections.Concurrent;
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
    private readonly ConcurrentQueue<string> _errors = new();
    private readonly ConcurrentQueue<string> _problems = new();

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
    public Task<IPage> NewWallPageAsync() => NewPageAsync(1920, 1080);

    /// <summary>
    /// A fresh page in its own browser context (its own cookies: one person or one screen) at width×height. Its
    /// console errors and uncaught errors are collected for <see cref="AssertNoCspViolationOrUncaughtError"/>.
    /// </summary>
    public async Task<IPage> NewPageAsync(int width, int height, bool touch = false)
    {
        var context = await Browser.NewContextAsync(new BrowserNewContextOptions
        {
            ViewportSize = new ViewportSize { Width = width, Height = height },
            Locale = "en-GB",
            HasTouch = touch,
        });
        // A page load waits up to 60 s, not Playwright's 30 s: on CI's two shared cores a server's first render of a
        // page (JIT, first database reads) has taken longer than 30 s while another suite ran beside it.
        context.SetDefaultNavigationTimeout(60_000);
        var page = await context.NewPageAsync();
        page.Console += (_, message) =>
        {
            if (message.Type == "error")
            {
                var text = $"{page.Url}: {message.Text}";
                _errors.Enqueue(text);
                if (message.Text.Contains("Content Security Policy", StringComparison.OrdinalIgnoreCase))
                {
                    _problems.Enqueue("CSP violation at " + text);
                }
            }
        };
        page.PageError += (_, error) => _problems.Enqueue($"uncaught error at {page.Url}: {error}");
        return page;
    }

    /// <summary>Every console error seen so far on this session's pages.</summary>
    public IReadOnlyList<string> ConsoleErrors => [.. _errors];

    /// <summary>Fails when any page of this session reported a Content Security Policy violation or an uncaught error.</summary>
    public void AssertNoCspViolationOrUncaughtError()
    {
        var problems = _problems.ToArray();
        Assert.True(problems.Length == 0, string.Join(Environment.NewLine, problems));
    }

    public async ValueTask DisposeAsync()
    {
        await Browser.DisposeAsync();
        _playwright.Dispose();
    }
}
