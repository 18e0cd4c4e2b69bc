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

    /// <summary>Starts the server and waits (up to 60 s) until it answers PING.</summary>
    /// <exception cref="InvalidOperationException">redis-server is missing or did not answer (the message says why).</exception>
    public static async Task<RedisServerProcess> StartAsync()
    {
        var path = LocalServices.RedisServer
            ?? throw new InvalidOperationException("redis-server not found (apt install redis-server, or set OPSLVP_REDIS_SERVER); OPSLVP_REQUIRE_SERVICES=1 is set, so the test fails instead of being skipped");
        var port = LocalServices.FreePort();
        var info = new ProcessStartInfo(path) { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var argument in new[] { "--port", port.ToString(System.Globalization.CultureInfo.InvariantCulture), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--daemonize", "no" })
        {
            info.ArgumentList.Add(argument);
        }
        var process = Process.Start(info) ?? throw new InvalidOperationException("could not start redis-server");
        process.OutputDataReceived += (_, _) => { };
        process.ErrorDataReceived += (_, _) => { };
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
                    return server;
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
                server.Dispose();
                throw new InvalidOperationException($"redis-server on port {port} did not answer PING (exited: {process.HasExited})");
            }
            await Task.Delay(100);
        }
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
