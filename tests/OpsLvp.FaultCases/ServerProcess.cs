using System.Collections.Concurrent;
using System.Diagnostics;
using System.Net;

namespace OpsLvp.FaultCases;

/// <summary>
/// The real server as its own process (<c>dotnet OpsLvp.Web.dll</c> from the caller's output folder) on 127.0.0.1 and a
/// free port, on a given data folder with <see cref="FaultProfile"/>, the simulator off and a 200 ms engine tick. Its
/// log lines are kept (the last few hundred) so a death can be explained; <see cref="Kill"/> is SIGKILL.
/// </summary>
public sealed class ServerProcess : IDisposable
{
    private const int LinesKept = 400;

    private readonly Process _process;

    private readonly ConcurrentQueue<string> _lines = new();

    private ServerProcess(Process process)
    {
        _process = process;
    }

    /// <summary>The address the server listens on (it picks a free port itself, so no other server can be on it).</summary>
    public Uri BaseAddress { get; private set; } = null!;

    public HttpClient Client { get; private set; } = null!;

    private readonly TaskCompletionSource<Uri> _listening = new(TaskCreationOptions.RunContinuationsAsynchronously);

    public int Id => _process.Id;

    public bool HasExited => _process.HasExited;

    /// <summary>How the process ended, e.g. "exit code 135 (signal 7, SIGBUS)"; null while it runs.</summary>
    public string? ExitDescription
    {
        get
        {
            if (!_process.HasExited)
            {
                return null;
            }
            var code = _process.ExitCode;
            return code > 128 && code < 160 ? $"exit code {code} (signal {code - 128}{SignalName(code - 128)})" : $"exit code {code}";
        }
    }

    /// <summary>The last log lines the server wrote (stdout and stderr).</summary>
    public IReadOnlyList<string> LastLines => _lines.ToArray();

    /// <summary>Starts the server and waits (up to 120 s, generous for a loaded machine) until <c>/health</c> answers 200.</summary>
    public static async Task<ServerProcess> StartAsync(string dataFolder, string profilePath, IDictionary<string, string>? settings = null)
    {
        var dll = Path.Combine(AppContext.BaseDirectory, "OpsLvp.Web.dll");
        if (!File.Exists(dll))
        {
            throw new FileNotFoundException($"the server is not built next to the fault suite: {dll}");
        }
        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = AppContext.BaseDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        start.ArgumentList.Add(dll);
        start.ArgumentList.Add("--urls");
        // port 0: Kestrel takes a free port itself and says which ("Now listening on:"); a port picked here and bound by
        // the server later may meanwhile be taken by another test's server, which would then answer in its place
        start.ArgumentList.Add("http://127.0.0.1:0");
        start.Environment["Storage__DataFolder"] = dataFolder;
        start.Environment["Engine__ProfilePath"] = profilePath;
        start.Environment["Engine__TickInterval"] = "00:00:00.200";
        start.Environment["Demo__Simulator"] = "Off";
        start.Environment["Feeds__Push__ApiKeys__0__Name"] = "fault-suite";
        start.Environment["Feeds__Push__ApiKeys__0__Key"] = FaultProfile.PushKey;
        start.Environment["Logging__LogLevel__Default"] = "Warning";
        start.Environment["Logging__LogLevel__Microsoft.Hosting.Lifetime"] = "Information";
        start.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        foreach (var (key, value) in settings ?? new Dictionary<string, string>())
        {
            start.Environment[key] = value;
        }
        var process = Process.Start(start)!;
        var server = new ServerProcess(process);
        process.OutputDataReceived += (_, e) => server.Keep(e.Data);
        process.ErrorDataReceived += (_, e) => server.Keep(e.Data);
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        var deadline = DateTime.UtcNow.AddSeconds(120);
        while (!server._listening.Task.IsCompleted)
        {
            if (process.HasExited || DateTime.UtcNow > deadline)
            {
                var why = server.ExitDescription ?? "not listening after 120 s";
                server.Dispose();
                throw new InvalidOperationException($"server did not come up ({why}): {string.Join(" | ", server.LastLines.TakeLast(10))}");
            }
            await Task.Delay(100);
        }
        server.BaseAddress = await server._listening.Task;
        server.Client = new HttpClient { BaseAddress = server.BaseAddress, Timeout = TimeSpan.FromSeconds(60) };
        while (true)
        {
            try
            {
                using var probe = new HttpClient { BaseAddress = server.BaseAddress, Timeout = TimeSpan.FromSeconds(5) };
                using var response = await probe.GetAsync(new Uri("/health", UriKind.Relative));
                if (response.StatusCode == HttpStatusCode.OK)
                {
                    return server;
                }
            }
            catch (HttpRequestException)
            {
            }
            catch (TaskCanceledException)
            {
            }
            if (process.HasExited || DateTime.UtcNow > deadline)
            {
                var why = server.ExitDescription ?? "not answering after 120 s";
                server.Dispose();
                throw new InvalidOperationException($"server did not come up ({why}): {string.Join(" | ", server.LastLines.TakeLast(10))}");
            }
            await Task.Delay(100);
        }
    }

    /// <summary>
    /// An orderly stop: SIGTERM (the host shuts down, writing its shutdown anchor), then waits up to 60 s for the exit;
    /// SIGKILL if it has not ended by then. Returns the exit description.
    /// </summary>
    public async Task<string> StopAsync()
    {
        if (!_process.HasExited)
        {
            using (var term = Process.Start(new ProcessStartInfo("kill") { ArgumentList = { "-TERM", _process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture) }, UseShellExecute = false })!)
            {
                await term.WaitForExitAsync();
            }
            using var wait = new CancellationTokenSource(TimeSpan.FromSeconds(60));
            try
            {
                await _process.WaitForExitAsync(wait.Token);
            }
            catch (OperationCanceledException)
            {
                Kill();
                return "did not stop within 60 s of SIGTERM: killed";
            }
        }
        return ExitDescription!;
    }

    /// <summary>SIGKILL, and waits until the process is gone.</summary>
    public void Kill()
    {
        if (!_process.HasExited)
        {
            _process.Kill(entireProcessTree: true);
            _process.WaitForExit();
        }
    }

    public void Dispose()
    {
        Kill();
        Client?.Dispose();
        _process.Dispose();
    }

    private void Keep(string? line)
    {
        if (line is null)
        {
            return;
        }
        _lines.Enqueue(line);
        if (!_listening.Task.IsCompleted && ListeningLine.Match(line) is { Success: true } m)
        {
            _listening.TrySetResult(new Uri(m.Groups[1].Value));
        }
        while (_lines.Count > LinesKept && _lines.TryDequeue(out _))
        {
        }
    }

    private static string SignalName(int signal) => signal switch
    {
        6 => ", SIGABRT",
        7 => ", SIGBUS",
        9 => ", SIGKILL",
        11 => ", SIGSEGV",
        15 => ", SIGTERM",
        _ => "",
    };

    private static readonly System.Text.RegularExpressions.Regex ListeningLine = new(@"Now listening on:\s*(http://\S+)", System.Text.RegularExpressions.RegexOptions.CultureInvariant);
}
