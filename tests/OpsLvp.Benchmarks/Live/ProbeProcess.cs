using System.Diagnostics;
using System.Globalization;
using System.Text;
using System.Text.Json;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// <see cref="IProbes"/> in a second OS process: this program started again with <see cref="RoleArguments"/>, which
/// runs <see cref="LocalProbes"/> there and answers one line on standard output for each line on standard input
/// (<see cref="RunChildAsync"/>). The servers' process then no longer runs the clients' receive loops, parsing and
/// garbage. Receipt times cross as raw <see cref="Stopwatch.GetTimestamp"/> values: on Linux .NET reads them from
/// <c>clock_gettime(CLOCK_MONOTONIC)</c> (dotnet/runtime, <c>src/native/libs/System.Native/pal_time.c</c>,
/// <c>SystemNative_GetTimestamp</c>; from memory), and CLOCK_MONOTONIC is one system-wide clock (clock_gettime(2)),
/// so a timestamp taken in one process can be subtracted from one taken in the other. <see cref="StartAsync"/> checks
/// it rather than trusting it: same <see cref="Stopwatch.Frequency"/>, and the child's reading lies between the
/// parent's readings before and after asking, five times.
/// </summary>
/// <remarks>
/// Protocol, tab-separated, one request and one answer at a time: <c>clock</c> → <c>clock FREQ TS</c>;
/// <c>connect JSON</c> (the <see cref="ProbeSetup"/> list) → <c>connected</c>; <c>arm SETUP -|=MARKER</c> →
/// <c>armed DELIVERIES</c>; <c>wait SETUP MS</c> → <c>received TS,TS,…</c>; <c>count SETUP</c> →
/// <c>count DELIVERIES CHARS</c>; <c>quit</c> or end of input → the child disconnects and ends. A request that fails
/// is answered <c>timeout MESSAGE</c> (a wait ran out) or <c>error MESSAGE</c>, and the child keeps serving.
/// Anything else the child prints goes to standard error, which the parent copies to its own with a prefix.
/// </remarks>
internal sealed class ProbeProcess : IProbes
{
    /// <summary>The arguments that make this program a client process instead of a benchmark run.</summary>
    public static readonly string[] RoleArguments = ["--role", "clients"];

    /// <summary>How long a request other than connect and wait may take to be answered (loaded machine: generous).</summary>
    private static readonly TimeSpan AnswerLimit = TimeSpan.FromSeconds(60);

    /// <summary>How long connecting every client may take (up to 2 500 connections on a loaded machine).</summary>
    private static readonly TimeSpan ConnectLimit = TimeSpan.FromMinutes(10);

    private readonly Process _process;
    private readonly Task _errors;

    private ProbeProcess(Process process)
    {
        _process = process;
        _errors = Task.Run(async () =>
        {
            while (await process.StandardError.ReadLineAsync() is { } line)
            {
                await Console.Error.WriteLineAsync($"[clients {process.Id}] {line}");
            }
        });
    }

    /// <summary>The child's process id (for the run's notes).</summary>
    public int ProcessId => _process.Id;

    /// <summary>Starts the client process and checks that its <see cref="Stopwatch"/> clock is this process's.</summary>
    /// <exception cref="InvalidOperationException">It did not start, or its clock is not this one.</exception>
    public static async Task<ProbeProcess> StartAsync()
    {
        var path = Environment.ProcessPath ?? throw new InvalidOperationException("push-ha: cannot start the client process: this program's path is unknown");
        var info = new ProcessStartInfo(path)
        {
            RedirectStandardInput = true,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
            StandardOutputEncoding = Encoding.UTF8,
            StandardErrorEncoding = Encoding.UTF8,
        };
        // run as `dotnet OpsLvp.Benchmarks.dll`: the host again, with the assembly
        if (string.Equals(Path.GetFileNameWithoutExtension(path), "dotnet", StringComparison.OrdinalIgnoreCase))
        {
            info.ArgumentList.Add(typeof(ProbeProcess).Assembly.Location);
        }
        foreach (var argument in RoleArguments)
        {
            info.ArgumentList.Add(argument);
        }
        Process process;
        try
        {
            process = Process.Start(info) ?? throw new InvalidOperationException($"push-ha: the client process ({path}) did not start");
        }
        catch (System.ComponentModel.Win32Exception ex)
        {
            throw new InvalidOperationException($"push-ha: the client process ({path}) did not start: {ex.Message}", ex);
        }
        var probes = new ProbeProcess(process);
        try
        {
            for (var i = 0; i < 5; i++)
            {
                var before = Stopwatch.GetTimestamp();
                var answer = await AskAsync(probes, "clock", AnswerLimit);
                var after = Stopwatch.GetTimestamp();
                var frequency = long.Parse(answer[1], CultureInfo.InvariantCulture);
                var theirs = long.Parse(answer[2], CultureInfo.InvariantCulture);
                if (frequency != Stopwatch.Frequency || theirs < before || theirs > after)
                {
                    throw new InvalidOperationException(string.Create(CultureInfo.InvariantCulture,
                        $"push-ha: the client process's Stopwatch clock is not this process's (frequency {frequency} against {Stopwatch.Frequency}; its reading {theirs} not between {before} and {after}): latencies across the two would be wrong"));
                }
            }
        }
        catch
        {
            await probes.DisposeAsync();
            throw;
        }
        return probes;
    }

    public async Task ConnectAsync(IReadOnlyList<ProbeSetup> setups) =>
        await AskAsync(this, "connect\t" + JsonSerializer.Serialize(setups), ConnectLimit);

    public async Task<long> ArmAsync(int setup, string? marker)
    {
        var answer = await AskAsync(this, string.Create(CultureInfo.InvariantCulture, $"arm\t{setup}\t{(marker is null ? "-" : "=" + marker)}"), AnswerLimit);
        return long.Parse(answer[1], CultureInfo.InvariantCulture);
    }

    public async Task<long[]> WaitAsync(int setup, TimeSpan timeout)
    {
        var answer = await AskAsync(this, string.Create(CultureInfo.InvariantCulture, $"wait\t{setup}\t{(long)timeout.TotalMilliseconds}"), timeout + AnswerLimit);
        return answer[1].Length == 0 ? [] : [.. answer[1].Split(',').Select(t => long.Parse(t, CultureInfo.InvariantCulture))];
    }

    public async Task<(long Deliveries, int PayloadChars)> CountAsync(int setup)
    {
        var answer = await AskAsync(this, string.Create(CultureInfo.InvariantCulture, $"count\t{setup}"), AnswerLimit);
        return (long.Parse(answer[1], CultureInfo.InvariantCulture), int.Parse(answer[2], CultureInfo.InvariantCulture));
    }

    public async ValueTask DisposeAsync()
    {
        try
        {
            if (!_process.HasExited)
            {
                await _process.StandardInput.WriteLineAsync("quit");
                _process.StandardInput.Close();
            }
        }
        catch (IOException)
        {
            // it ended already: the pipe is closed
        }
        using var wait = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        try
        {
            await _process.WaitForExitAsync(wait.Token);
        }
        catch (OperationCanceledException)
        {
            // the process this object started, by its own handle; nothing else is touched
            _process.Kill(entireProcessTree: true);
            await _process.WaitForExitAsync(CancellationToken.None);
        }
        await _errors;
        _process.Dispose();
    }

    private static async Task<string[]> AskAsync(ProbeProcess probes, string request, TimeSpan limit)
    {
        var verb = request.Split('\t', 2)[0];
        try
        {
            await probes._process.StandardInput.WriteLineAsync(request);
            await probes._process.StandardInput.FlushAsync();
        }
        catch (IOException ex)
        {
            throw new InvalidOperationException($"push-ha: the client process could not be asked '{verb}' (ended? {ex.Message}); its standard error is above", ex);
        }
        string? line;
        try
        {
            line = await probes._process.StandardOutput.ReadLineAsync().WaitAsync(limit);
        }
        catch (TimeoutException)
        {
            throw new TimeoutException($"push-ha: the client process did not answer '{verb}' within {limit.TotalSeconds:0} s");
        }
        if (line is null)
        {
            await probes._process.WaitForExitAsync();
            throw new InvalidOperationException($"push-ha: the client process ended (exit code {probes._process.ExitCode}) before answering '{verb}'; its standard error is above");
        }
        var answer = line.Split('\t');
        return answer[0] switch
        {
            "timeout" => throw new TimeoutException(answer.ElementAtOrDefault(1) ?? "timed out"),
            "error" => throw new InvalidOperationException($"push-ha: the client process could not do '{verb}': {answer.ElementAtOrDefault(1)}"),
            _ when answer[0] == verb || (verb, answer[0]) is ("connect", "connected") or ("arm", "armed") or ("wait", "received") => answer,
            _ => throw new InvalidOperationException($"push-ha: the client process answered '{verb}' with '{line}'"),
        };
    }

    /// <summary>
    /// The client process's main loop (this program started with <see cref="RoleArguments"/>): serves the requests of
    /// the remarks above until <c>quit</c> or the end of standard input, then disconnects every client. Returns the
    /// exit code (0).
    /// </summary>
    public static async Task<int> RunChildAsync()
    {
        using var input = new StreamReader(Console.OpenStandardInput(), Encoding.UTF8);
        await using var output = new StreamWriter(Console.OpenStandardOutput(), new UTF8Encoding(false)) { AutoFlush = true };
        await using var probes = new LocalProbes();
        while (await input.ReadLineAsync() is { } line)
        {
            var request = line.Split('\t');
            string answer;
            try
            {
                if (request[0] == "quit")
                {
                    break;
                }
                answer = await AnswerAsync(probes, request);
            }
            catch (TimeoutException ex)
            {
                answer = "timeout\t" + OneLine(ex.Message);
            }
#pragma warning disable CA1031 // any failure is the parent's to report: answered, and the next request served
            catch (Exception ex)
#pragma warning restore CA1031
            {
                await Console.Error.WriteLineAsync($"{request[0]}: {ex}");
                answer = "error\t" + OneLine($"{ex.GetType().Name}: {ex.Message}");
            }
            await output.WriteLineAsync(answer);
        }
        return 0;
    }

    private static async Task<string> AnswerAsync(LocalProbes probes, string[] request)
    {
        int Setup() => int.Parse(request[1], CultureInfo.InvariantCulture);
        switch (request[0])
        {
            case "clock":
                return string.Create(CultureInfo.InvariantCulture, $"clock\t{Stopwatch.Frequency}\t{Stopwatch.GetTimestamp()}");
            case "connect":
                await probes.ConnectAsync(JsonSerializer.Deserialize<List<ProbeSetup>>(request[1]) ?? throw new FormatException("connect: no setups"));
                return "connected";
            case "arm":
                var marker = request[2] == "-" ? null : request[2][1..];
                var previous = await probes.ArmAsync(Setup(), marker);
                return string.Create(CultureInfo.InvariantCulture, $"armed\t{previous}");
            case "wait":
                var received = await probes.WaitAsync(Setup(), TimeSpan.FromMilliseconds(long.Parse(request[2], CultureInfo.InvariantCulture)));
                return "received\t" + string.Join(',', received.Select(t => t.ToString(CultureInfo.InvariantCulture)));
            case "count":
                var (deliveries, chars) = await probes.CountAsync(Setup());
                return string.Create(CultureInfo.InvariantCulture, $"count\t{deliveries}\t{chars}");
            default:
                throw new FormatException($"unknown request '{request[0]}'");
        }
    }

    private static string OneLine(string text) => text.ReplaceLineEndings(" ").Replace('\t', ' ');
}
