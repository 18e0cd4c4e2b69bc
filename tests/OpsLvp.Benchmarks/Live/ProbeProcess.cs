using System.Diagnostics;
using System.Globalization;
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
/// Protocol (<see cref="ChildProcess"/>: tab-separated, one request and one answer at a time; <c>timeout</c> and
/// <c>error</c> answers; standard error copied): <c>clock</c> → <c>clock FREQ TS</c>; <c>connect JSON</c> (the
/// <see cref="ProbeSetup"/> list) → <c>connected</c>; <c>arm SETUP -|=MARKER</c> → <c>armed DELIVERIES</c>;
/// <c>wait SETUP MS</c> → <c>received TS,TS,…</c>; <c>count SETUP</c> → <c>count DELIVERIES CHARS</c>; <c>quit</c> or
/// end of input → the child disconnects and ends.
/// </remarks>
internal sealed class ProbeProcess : IProbes
{
    /// <summary>The arguments that make this program a client process instead of a benchmark run.</summary>
    public static readonly string[] RoleArguments = ["--role", "clients"];

    /// <summary>How long connecting every client may take (up to 2 500 connections on a loaded machine).</summary>
    private static readonly TimeSpan ConnectLimit = TimeSpan.FromMinutes(10);

    private readonly ChildProcess _child;

    private ProbeProcess(ChildProcess child) => _child = child;

    /// <summary>The child's process id (for the run's notes).</summary>
    public int ProcessId => _child.ProcessId;

    /// <summary>Starts the client process and checks that its <see cref="Stopwatch"/> clock is this process's.</summary>
    /// <exception cref="InvalidOperationException">It did not start, or its clock is not this one.</exception>
    public static async Task<ProbeProcess> StartAsync()
    {
        var probes = new ProbeProcess(ChildProcess.Start(RoleArguments, "the client process", "clients"));
        try
        {
            for (var i = 0; i < 5; i++)
            {
                var before = Stopwatch.GetTimestamp();
                var answer = await probes._child.AskAsync("clock", "clock", ChildProcess.AnswerLimit);
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
        await _child.AskAsync("connect\t" + JsonSerializer.Serialize(setups), "connected", ConnectLimit);

    public async Task<long> ArmAsync(int setup, string? marker)
    {
        var answer = await _child.AskAsync(string.Create(CultureInfo.InvariantCulture, $"arm\t{setup}\t{(marker is null ? "-" : "=" + marker)}"), "armed", ChildProcess.AnswerLimit);
        return long.Parse(answer[1], CultureInfo.InvariantCulture);
    }

    public async Task<long[]> WaitAsync(int setup, TimeSpan timeout)
    {
        var answer = await _child.AskAsync(string.Create(CultureInfo.InvariantCulture, $"wait\t{setup}\t{(long)timeout.TotalMilliseconds}"), "received", timeout + ChildProcess.AnswerLimit);
        return answer[1].Length == 0 ? [] : [.. answer[1].Split(',').Select(t => long.Parse(t, CultureInfo.InvariantCulture))];
    }

    public async Task<(long Deliveries, int PayloadChars)> CountAsync(int setup)
    {
        var answer = await _child.AskAsync(string.Create(CultureInfo.InvariantCulture, $"count\t{setup}"), "count", ChildProcess.AnswerLimit);
        return (long.Parse(answer[1], CultureInfo.InvariantCulture), int.Parse(answer[2], CultureInfo.InvariantCulture));
    }

    public ValueTask DisposeAsync() => _child.DisposeAsync();

    /// <summary>
    /// The client process's main loop (this program started with <see cref="RoleArguments"/>): serves the requests of
    /// the remarks above until <c>quit</c> or the end of standard input, then disconnects every client. Returns the
    /// exit code (0).
    /// </summary>
    public static async Task<int> RunChildAsync()
    {
        await using var probes = new LocalProbes();
        return await ChildProcess.ServeAsync(request => AnswerAsync(probes, request));
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
}
