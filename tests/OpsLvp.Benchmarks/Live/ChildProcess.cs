using System.Diagnostics;
using System.Text;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// This program started again in a role of its own (<see cref="ProbeProcess"/>: the hub clients; <see cref="NodeProcess"/>:
/// one server node), spoken to one line at a time: the parent writes one request a line on the child's standard input,
/// fields tab-separated, and reads one answer a line from its standard output (<see cref="AskAsync"/>); the child
/// serves them with <see cref="ServeAsync"/>. An answer <c>timeout MESSAGE</c> (a wait ran out) or <c>error MESSAGE</c>
/// (the request failed; the child keeps serving) becomes an exception in the parent. Anything else the child prints
/// goes to its standard error, which the parent copies to its own with a prefix.
/// </summary>
/// <remarks>
/// No orphans: <see cref="DisposeAsync"/> asks <c>quit</c>, closes the child's input and kills the child (by the
/// handle this object holds) if it has not ended within <see cref="StopLimit"/>; the child is also killed when this
/// process exits without disposing it (<see cref="AppDomain.ProcessExit"/>: a normal end, or SIGTERM, SIGINT or SIGHUP,
/// which <see cref="BenchmarksProgram.Main"/> turns into one), and a child
/// ends by itself when its input closes (the parent killed: the pipe's write end goes with it).
/// </remarks>
internal sealed class ChildProcess : IAsyncDisposable
{
    /// <summary>How long a request that waits for nothing in particular may take to be answered (loaded machine: generous).</summary>
    public static readonly TimeSpan AnswerLimit = TimeSpan.FromSeconds(60);

    /// <summary>How long a child may take to end after <c>quit</c> before it is killed.</summary>
    private static readonly TimeSpan StopLimit = TimeSpan.FromSeconds(60);

    private readonly Process _process;
    private readonly string _what;
    private readonly Task _errors;
    private readonly EventHandler _killAtExit;

    private ChildProcess(Process process, string what, string prefix)
    {
        _process = process;
        _what = what;
        _errors = Task.Run(async () =>
        {
            while (await process.StandardError.ReadLineAsync() is { } line)
            {
                await Console.Error.WriteLineAsync($"[{prefix} {process.Id}] {line}");
            }
        });
        _killAtExit = (_, _) => Kill();
        AppDomain.CurrentDomain.ProcessExit += _killAtExit;
    }

    /// <summary>The child's process id (for the run's notes).</summary>
    public int ProcessId => _process.Id;

    /// <summary>
    /// Starts this program again with <paramref name="roleArguments"/>. <paramref name="what"/> names the child in
    /// messages ("the client process"), <paramref name="prefix"/> on the lines of its standard error.
    /// </summary>
    /// <exception cref="InvalidOperationException">It did not start.</exception>
    public static ChildProcess Start(IReadOnlyList<string> roleArguments, string what, string prefix)
    {
        var path = Environment.ProcessPath ?? throw new InvalidOperationException($"push-ha: cannot start {what}: this program's path is unknown");
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
            info.ArgumentList.Add(typeof(ChildProcess).Assembly.Location);
        }
        foreach (var argument in roleArguments)
        {
            info.ArgumentList.Add(argument);
        }
        try
        {
            var process = Process.Start(info) ?? throw new InvalidOperationException($"push-ha: {what} ({path}) did not start");
            return new ChildProcess(process, what, prefix);
        }
        catch (System.ComponentModel.Win32Exception ex)
        {
            throw new InvalidOperationException($"push-ha: {what} ({path}) did not start: {ex.Message}", ex);
        }
    }

    /// <summary>Sends <paramref name="request"/> (fields joined by tabs) and returns the answer's fields.</summary>
    /// <param name="answerVerb">The first field the answer must have ("connected" for "connect").</param>
    /// <exception cref="TimeoutException">No answer within <paramref name="limit"/>, or the child answered <c>timeout</c>.</exception>
    /// <exception cref="InvalidOperationException">The child ended, answered <c>error</c> or something else than <paramref name="answerVerb"/>.</exception>
    public async Task<string[]> AskAsync(string request, string answerVerb, TimeSpan limit)
    {
        var verb = request.Split('\t', 2)[0];
        try
        {
            await _process.StandardInput.WriteLineAsync(request);
            await _process.StandardInput.FlushAsync();
        }
        catch (IOException ex)
        {
            throw new InvalidOperationException($"push-ha: {_what} could not be asked '{verb}' (ended? {ex.Message}); its standard error is above", ex);
        }
        string? line;
        try
        {
            line = await _process.StandardOutput.ReadLineAsync().WaitAsync(limit);
        }
        catch (TimeoutException)
        {
            throw new TimeoutException($"push-ha: {_what} did not answer '{verb}' within {limit.TotalSeconds:0} s");
        }
        if (line is null)
        {
            await _process.WaitForExitAsync();
            throw new InvalidOperationException($"push-ha: {_what} ended (exit code {_process.ExitCode}) before answering '{verb}'; its standard error is above");
        }
        var answer = line.Split('\t');
        return answer[0] switch
        {
            "timeout" => throw new TimeoutException(answer.ElementAtOrDefault(1) ?? "timed out"),
            "error" => throw new InvalidOperationException($"push-ha: {_what} could not do '{verb}': {answer.ElementAtOrDefault(1)}"),
            _ when answer[0] == answerVerb => answer,
            _ => throw new InvalidOperationException($"push-ha: {_what} answered '{verb}' with '{line}'"),
        };
    }

    public async ValueTask DisposeAsync()
    {
        AppDomain.CurrentDomain.ProcessExit -= _killAtExit;
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
        using var wait = new CancellationTokenSource(StopLimit);
        try
        {
            await _process.WaitForExitAsync(wait.Token);
        }
        catch (OperationCanceledException)
        {
            Kill();
            await _process.WaitForExitAsync(CancellationToken.None);
        }
        await _errors;
        _process.Dispose();
    }

    /// <summary>Kills the process this object started, by its own handle; nothing else is touched.</summary>
    private void Kill()
    {
        try
        {
            if (!_process.HasExited)
            {
                _process.Kill(entireProcessTree: true);
            }
        }
        catch (InvalidOperationException)
        {
            // it ended meanwhile
        }
    }

    /// <summary>
    /// The child's main loop: reads requests from standard input and writes what <paramref name="answer"/> returns for
    /// each (its fields split on tabs) until <c>quit</c> or the end of input; returns the exit code (0). From here on,
    /// anything written to <see cref="Console.Out"/> (a logger) goes to standard error: standard output carries the
    /// answers only.
    /// </summary>
    public static async Task<int> ServeAsync(Func<string[], Task<string>> answer)
    {
        using var input = new StreamReader(Console.OpenStandardInput(), Encoding.UTF8);
        await using var output = new StreamWriter(Console.OpenStandardOutput(), new UTF8Encoding(false)) { AutoFlush = true };
        Console.SetOut(Console.Error);
        while (await input.ReadLineAsync() is { } line)
        {
            var request = line.Split('\t');
            string reply;
            try
            {
                if (request[0] == "quit")
                {
                    break;
                }
                reply = await answer(request);
            }
            catch (TimeoutException ex)
            {
                reply = "timeout\t" + OneLine(ex.Message);
            }
#pragma warning disable CA1031 // any failure is the parent's to report: answered, and the next request served
            catch (Exception ex)
#pragma warning restore CA1031
            {
                await Console.Error.WriteLineAsync($"{request[0]}: {ex}");
                reply = "error\t" + OneLine($"{ex.GetType().Name}: {ex.Message}");
            }
            await output.WriteLineAsync(reply);
        }
        return 0;
    }

    private static string OneLine(string text) => text.ReplaceLineEndings(" ").Replace('\t', ' ');
}
