using System.Collections.Concurrent;
using System.Diagnostics;
using System.Net;
using System.Text.RegularExpressions;

namespace OpsLvp.Web.Tests.Hosting;

/// <summary>A published OpsLvp.Web started as its own process, in Production, on a free port of 127.0.0.1.</summary>
public sealed partial class PublishedServer : IAsyncDisposable
{
    private readonly Process _process;

    private readonly ConcurrentQueue<string> _output;

    private PublishedServer(Process process, ConcurrentQueue<string> output, Uri address)
    {
        _process = process;
        _output = output;
        Client = new HttpClient { BaseAddress = address, Timeout = TimeSpan.FromSeconds(20) };
    }

    public HttpClient Client { get; }

    /// <summary>Everything the server wrote so far (stdout and stderr), one entry per line.</summary>
    public IReadOnlyList<string> Output => [.. _output];

    public static async Task<PublishedServer> StartAsync(string appFolder, string workingFolder, string[] args, IReadOnlyDictionary<string, string>? environment = null)
    {
        var output = new ConcurrentQueue<string>();
        var process = Start(appFolder, workingFolder, ["--urls", "http://127.0.0.1:0", .. args], output, environment);
        var deadline = DateTime.UtcNow.AddSeconds(90); // generous: a loaded CI machine can take tens of seconds to start
        Uri? address = null;
        while (address is null)
        {
            if (process.HasExited || DateTime.UtcNow > deadline)
            {
                Stop(process);
                throw new Xunit.Sdk.XunitException($"the published build did not start; its output:{Environment.NewLine}{string.Join(Environment.NewLine, output)}");
            }
            address = output.Select(l => Listening().Match(l)).FirstOrDefault(m => m.Success) is { } m ? new Uri(m.Groups[1].Value) : null;
            await Task.Delay(200);
        }
        var server = new PublishedServer(process, output, address);
        while (true)
        {
            try
            {
                using var response = await server.Client.GetAsync(new Uri("/health", UriKind.Relative));
                if (response.StatusCode == HttpStatusCode.OK)
                {
                    return server;
                }
            }
            catch (HttpRequestException)
            {
            }
            if (process.HasExited || DateTime.UtcNow > deadline)
            {
                await server.DisposeAsync();
                throw new Xunit.Sdk.XunitException($"the published build did not answer /health; its output:{Environment.NewLine}{string.Join(Environment.NewLine, output)}");
            }
            await Task.Delay(250);
        }
    }

    /// <summary>Starts the build and waits (up to 90 s) for it to exit on its own: exit code and everything it wrote.</summary>
    public static async Task<(int Code, string Output)> RunToExitAsync(string appFolder, string workingFolder, string[] args)
    {
        var output = new ConcurrentQueue<string>();
        using var process = Start(appFolder, workingFolder, ["--urls", "http://127.0.0.1:0", .. args], output);
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(90));
        try
        {
            await process.WaitForExitAsync(timeout.Token);
        }
        catch (OperationCanceledException)
        {
            Stop(process);
            throw new Xunit.Sdk.XunitException($"the build did not stop; its output:{Environment.NewLine}{string.Join(Environment.NewLine, output)}");
        }
        process.WaitForExit(); // drains the redirected output
        return (process.ExitCode, string.Join(Environment.NewLine, output));
    }

    private static Process Start(string appFolder, string workingFolder, string[] args, ConcurrentQueue<string> output, IReadOnlyDictionary<string, string>? environment = null)
    {
        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = workingFolder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        start.ArgumentList.Add(Path.Combine(appFolder, "OpsLvp.Web.dll"));
        foreach (var a in args)
        {
            start.ArgumentList.Add(a);
        }
        start.Environment["ASPNETCORE_ENVIRONMENT"] = "Production";
        start.Environment.Remove("DOTNET_ENVIRONMENT");
        start.Environment.Remove("ASPNETCORE_CONTENTROOT");
        start.Environment.Remove("DOTNET_CONTENTROOT");
        start.Environment["Logging__LogLevel__Microsoft.Hosting.Lifetime"] = "Information";
        foreach (var (key, value) in environment ?? new Dictionary<string, string>())
        {
            start.Environment[key] = value;
        }
        var process = Process.Start(start)!;
        process.OutputDataReceived += (_, e) => { if (e.Data is not null) { output.Enqueue(e.Data); } };
        process.ErrorDataReceived += (_, e) => { if (e.Data is not null) { output.Enqueue(e.Data); } };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        return process;
    }

    private static void Stop(Process process)
    {
        try
        {
            if (!process.HasExited)
            {
                process.Kill(entireProcessTree: true);
                process.WaitForExit(30_000);
            }
        }
        catch (InvalidOperationException)
        {
        }
    }

    [GeneratedRegex(@"Now listening on: (http://127\.0\.0\.1:\d+)")]
    private static partial Regex Listening();

    public ValueTask DisposeAsync()
    {
        Client.Dispose();
        Stop(_process);
        _process.Dispose();
        return ValueTask.CompletedTask;
    }
}
