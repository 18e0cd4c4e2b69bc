using System.Diagnostics;
using System.Globalization;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Playwright;
using OpsLvp.Benchmarks.Live;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Web.Engine;

namespace OpsLvp.Benchmarks.Circuits;

/// <summary>
/// Server memory per connected Blazor circuit: a fresh in-process server per measurement with every demo sensor
/// reporting (<see cref="BenchSensorFeed"/>), N headless Chromium pages
/// (one browser, one context signed in through a display link, renderer processes capped) each opening its own circuit, counted server-side by
/// <see cref="CircuitCounter"/>. Memory is the process's managed heap after a full blocking compacting GC and its
/// working set, before and after the circuits are open; per circuit = difference / N. The process also holds the
/// Playwright client objects of the pages (the same for every page measured, so they cancel in the difference
/// against the empty page).
/// </summary>
public static class CircuitMemoryHarness
{
    /// <summary>A route no page claims: the shell layout with the not-found text, the smallest circuit the app makes.</summary>
    public const string EmptyPage = "/bench-empty-page";

    public static async Task RunAsync(BenchOptions options, ResultsBook book, string command)
    {
        int[] counts = options.Quick ? [5, 15] : [50, 200];
        const string section = "Blazor circuit memory (server, per connected circuit)";
        var page = await PickPageAsync();
        if (page != "/wall")
        {
            book.Note($"Circuit memory: /wall is not on this build; measured against '{page}' instead.");
        }
        using var playwright = await Playwright.CreateAsync();
        await using var browser = await playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
        {
            ExecutablePath = "/usr/bin/chromium",
            Headless = true,
            Args = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--renderer-process-limit=4", "--disable-renderer-backgrounding", "--disable-background-timer-throttling"],
        });
        foreach (var n in counts)
        {
            var empty = await MeasureAsync(browser, EmptyPage, n);
            var ours = await MeasureAsync(browser, page, n);
            book.Add(new ResultRow(section, $"empty page ({EmptyPage}), {n} circuits: heap per circuit", ResultsBook.FormatBytes(empty.HeapPerCircuit), null, null, null, null, command));
            book.Add(new ResultRow(section, $"empty page, {n} circuits: working set per circuit", ResultsBook.FormatBytes(empty.WorkingSetPerCircuit), null, null, null, null, command));
            book.Add(new ResultRow(section, $"{page}, {n} circuits: heap per circuit", ResultsBook.FormatBytes(ours.HeapPerCircuit), ours.HeapPerCircuit / empty.HeapPerCircuit, "empty page", null,
                $"{(ours.HeapPerCircuit < 1024 * 1024 ? "met" : "MISSED")}: < 1 MB", command));
            book.Add(new ResultRow(section, $"{page}, {n} circuits: working set per circuit", ResultsBook.FormatBytes(ours.WorkingSetPerCircuit), ours.WorkingSetPerCircuit / empty.WorkingSetPerCircuit, "empty page", null,
                $"{(ours.WorkingSetPerCircuit < 1024 * 1024 ? "met" : "MISSED")}: < 1 MB", command));
        }
    }

    /// <summary>/wall when a display link opens it on this build (the link sets the display cookie and redirects there), else "/".</summary>
    private static async Task<string> PickPageAsync()
    {
        await using var server = BenchServer.Start();
        var link = await server.IssueDisplayLinkAsync();
        using var handler = new HttpClientHandler { UseCookies = true, AllowAutoRedirect = true };
        using var http = new HttpClient(handler) { BaseAddress = server.BaseAddress };
        using var response = await http.GetAsync(new Uri(link, UriKind.Relative));
        return response.IsSuccessStatusCode && response.RequestMessage?.RequestUri?.AbsolutePath == "/wall" ? "/wall" : "/";
    }

    private static async Task<(double HeapPerCircuit, double WorkingSetPerCircuit)> MeasureAsync(IBrowser browser, string path, int n)
    {
        await using var server = BenchServer.Start();
        // Every sensor reports (and keeps reporting) so /wall shows a full aerodrome, not an empty one.
        var profile = Engine.BenchData.DemoProfile();
        await using var feed = await BenchSensorFeed.StartAsync(server, profile);
        await WaitForReadingsAsync(server, profile.Sensors.Count);
        var link = await server.IssueDisplayLinkAsync();
        var context = await browser.NewContextAsync();
        try
        {
            // One page first opens the display link (display cookie for the whole context, redirect to /wall), so
            // every later page is signed in and code paths, caches and pools are warm before the baseline.
            // A second warm page opens the measured route itself, so its first-render costs (component types,
            // caches) are in the baseline and not divided among the N circuits.
            var warm = await context.NewPageAsync();
            await warm.GotoAsync(new Uri(server.BaseAddress, link).ToString());
            var warmRoute = await context.NewPageAsync();
            await warmRoute.GotoAsync(new Uri(server.BaseAddress, path).ToString(), new PageGotoOptions { WaitUntil = WaitUntilState.Load, Timeout = 60_000 });
            await WaitForCircuitsAsync(server, 2);
            await Task.Delay(1000);
            var (heap0, ws0) = Snapshot();
            var pages = new List<IPage>(n);
            for (var i = 0; i < n; i++)
            {
                var p = await context.NewPageAsync();
                pages.Add(p);
                await p.GotoAsync(new Uri(server.BaseAddress, path).ToString(), new PageGotoOptions { WaitUntil = WaitUntilState.Load, Timeout = 60_000 });
            }
            await WaitForCircuitsAsync(server, n + 2);
            await Task.Delay(2000);
            var (heap1, ws1) = Snapshot();
            return ((heap1 - heap0) / (double)n, (ws1 - ws0) / (double)n);
        }
        finally
        {
            await context.CloseAsync();
        }
    }

    private static async Task WaitForReadingsAsync(BenchServer server, int count)
    {
        var engine = server.Services.GetRequiredService<LiveEngineHost>();
        var clock = Stopwatch.StartNew();
        while ((engine.State?.Latest.Count ?? 0) < count)
        {
            if (clock.Elapsed > TimeSpan.FromSeconds(30))
            {
                throw new TimeoutException(string.Create(CultureInfo.InvariantCulture, $"only {engine.State?.Latest.Count ?? 0} of {count} sensors reported within 30 s"));
            }
            await Task.Delay(100);
        }
    }

    private static async Task WaitForCircuitsAsync(BenchServer server, int count)
    {
        var clock = Stopwatch.StartNew();
        while (server.Circuits.Open < count)
        {
            if (clock.Elapsed > TimeSpan.FromSeconds(30))
            {
                throw new TimeoutException(string.Create(CultureInfo.InvariantCulture, $"only {server.Circuits.Open} of {count} circuits opened within 30 s"));
            }
            await Task.Delay(100);
        }
    }

    private static (long Heap, long WorkingSet) Snapshot()
    {
        for (var i = 0; i < 2; i++)
        {
            GC.Collect(GC.MaxGeneration, GCCollectionMode.Forced, blocking: true, compacting: true);
            GC.WaitForPendingFinalizers();
        }
        var heap = GC.GetTotalMemory(forceFullCollection: true);
        using var process = Process.GetCurrentProcess();
        process.Refresh();
        return (heap, process.WorkingSet64);
    }
}
