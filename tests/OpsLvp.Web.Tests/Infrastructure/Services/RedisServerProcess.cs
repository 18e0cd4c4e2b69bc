using System.Diagnostics;
using System.Net.Sockets;
using System.Text;

namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>
/// A throwaway <c>redis-server</c> on a free port of 127.0.0.1 (no persistence), started by the test and killed
/// when disposed.
/// </summary>
public sealed class RedisServerProcess : IDisposable
{
    private readonly Process _process;

    private RedisServerProcess(Process process, int port)
    {
        _process = process;
        Port = port;
    }

    public int Port { get; }

    /// <summary>The StackExchange.Redis-style configuration string (<c>127.0.0.1:port</c>).</summary>
    public string Configuration => $"127.0.0.1:{Port}";

    /// <summary>
    /// Starts the server and waits (up to 60 s) until it answers PING, and checks that the answer came from this process
    /// (INFO's <c>process_id</c>): the port was free when it was picked, but a server another test started meanwhile may
    /// hold it, and this one then exits. Up to <see cref="Attempts"/> ports are tried.
    /// </summary>
    /// <exception cref="InvalidOperationException">redis-server is missing or did not answer (the message says why).</exception>
    public static async Task<RedisServerProcess> StartAsync()
    {
        var path = LocalServices.RedisServer
            ?? throw new InvalidOperationException("redis-server not found (apt install redis-server, or set OPSLVP_REDIS_SERVER); OPSLVP_REQUIRE_SERVICES=1 is set, so the test fails instead of being skipped");
        var why = "";
        for (var attempt = 1; attempt <= Attempts; attempt++)
        {
            var (server, problem) = await TryStartAsync(path);
            if (server is not null)
            {
                return server;
            }
            why += $" attempt {attempt}: {problem};";
        }
        throw new InvalidOperationException($"redis-server did not start on a port of its own:{why}");
    }

    private const int Attempts = 5;

    private static async Task<(RedisServerProcess? Server, string? Problem)> TryStartAsync(string path)
    {
        var port = LocalServices.FreePort();
        var info = new ProcessStartInfo(path) { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var argument in new[] { "--port", port.ToString(System.Globalization.CultureInfo.InvariantCulture), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--daemonize", "no" })
        {
            info.ArgumentList.Add(argument);
        }
        var process = Process.Start(info) ?? throw new InvalidOperationException("could not start redis-server");
        var output = new System.Collections.Concurrent.ConcurrentQueue<string>();
        process.OutputDataReceived += (_, e) => Keep(output, e.Data);
        process.ErrorDataReceived += (_, e) => Keep(output, e.Data);
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        var server = new RedisServerProcess(process, port);
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (true)
        {
            try
            {
                if (await server.CommandAsync("PING") == "+PONG")
                {
                    var pid = await server.ProcessIdAsync();
                    if (pid == process.Id)
                    {
                        return (server, null);
                    }
                    server.Dispose();
                    return (null, $"port {port} answered by another redis-server (process {pid})");
                }
            }
            catch (SocketException) when (DateTime.UtcNow < deadline && !process.HasExited)
            {
            }
            catch (IOException) when (DateTime.UtcNow < deadline && !process.HasExited)
            {
            }
            if (process.HasExited || DateTime.UtcNow >= deadline)
            {
                var exited = process.HasExited;
                server.Dispose();
                return (null, $"port {port}: did not answer PING (exited: {exited}): {string.Join(" | ", output.TakeLast(3))}");
            }
            await Task.Delay(100);
        }
    }

    private static void Keep(System.Collections.Concurrent.ConcurrentQueue<string> lines, string? line)
    {
        if (line is not null)
        {
            lines.Enqueue(line);
            while (lines.Count > 50 && lines.TryDequeue(out _))
            {
            }
        }
    }

    /// <summary>The <c>process_id</c> of the server that answers on <see cref="Port"/> (from <c>INFO server</c>), or 0.</summary>
    private async Task<int> ProcessIdAsync()
    {
        using var client = new TcpClient();
        await client.ConnectAsync("127.0.0.1", Port);
        var stream = client.GetStream();
        await stream.WriteAsync(Encoding.ASCII.GetBytes("INFO server\r\n"));
        using var reader = new StreamReader(stream, Encoding.ASCII);
        // a bulk string: "$<length>", then "field:value" lines
        for (var line = await reader.ReadLineAsync(); line is not null && line.Length > 0; line = await reader.ReadLineAsync())
        {
            if (line.StartsWith("process_id:", StringComparison.Ordinal))
            {
                return int.Parse(line["process_id:".Length..], System.Globalization.CultureInfo.InvariantCulture);
            }
        }
        return 0;
    }

    /// <summary>Sends one inline command (RESP inline form) and returns the first reply line, e.g. <c>+PONG</c>.</summary>
    public async Task<string> CommandAsync(string inline)
    {
        using var client = new TcpClient();
        await client.ConnectAsync("127.0.0.1", Port);
        var stream = client.GetStream();
        await stream.WriteAsync(Encoding.ASCII.GetBytes(inline + "\r\n"));
        using var reader = new StreamReader(stream, Encoding.ASCII);
        return await reader.ReadLineAsync() ?? "";
    }

    public void Dispose()
    {
        try
        {
            if (!_process.HasExited)
            {
                _process.Kill(entireProcessTree: true);
                _process.WaitForExit(10_000);
            }
        }
        catch (InvalidOperationException)
        {
        }
        _process.Dispose();
    }
}
