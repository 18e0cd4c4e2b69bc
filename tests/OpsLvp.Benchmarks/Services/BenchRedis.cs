using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Net.Sockets;
using System.Text;

namespace OpsLvp.Benchmarks.Services;

/// <summary>
/// A throwaway <c>redis-server</c> for a benchmark run, the same recipe as the tests' <c>RedisServerProcess</c>
/// (not referenced so xunit stays out): a free port of 127.0.0.1, no persistence, killed when disposed or, not
/// disposed, when this process exits.
/// </summary>
public sealed class BenchRedis : IDisposable
{
    private readonly Process _process;
    private readonly EventHandler _killAtExit;

    private BenchRedis(Process process, int port)
    {
        _process = process;
        Port = port;
        _killAtExit = (_, _) => Kill();
        AppDomain.CurrentDomain.ProcessExit += _killAtExit;
    }

    public int Port { get; }

    /// <summary>The StackExchange.Redis configuration string (<c>127.0.0.1:port</c>).</summary>
    public string Configuration => string.Create(CultureInfo.InvariantCulture, $"127.0.0.1:{Port}");

    /// <summary><c>redis-server</c> (<c>OPSLVP_REDIS_SERVER</c>, else on the PATH or in /usr/bin), or null.</summary>
    public static string? Find()
    {
        var configured = Environment.GetEnvironmentVariable("OPSLVP_REDIS_SERVER");
        if (!string.IsNullOrWhiteSpace(configured))
        {
            return File.Exists(configured) ? configured : null;
        }
        return (Environment.GetEnvironmentVariable("PATH") ?? "/usr/bin").Split(':', StringSplitOptions.RemoveEmptyEntries)
            .Append("/usr/bin")
            .Select(d => Path.Combine(d, "redis-server"))
            .FirstOrDefault(File.Exists);
    }

    /// <summary>Starts the server and waits (up to 60 s) until it answers PING.</summary>
    /// <exception cref="InvalidOperationException">redis-server is missing or did not answer.</exception>
    public static async Task<BenchRedis> StartAsync()
    {
        var path = Find() ?? throw new InvalidOperationException("redis-server not found (apt install redis-server, or set OPSLVP_REDIS_SERVER)");
        int port;
        using (var listener = new TcpListener(IPAddress.Loopback, 0))
        {
            listener.Start();
            port = ((IPEndPoint)listener.LocalEndpoint).Port;
        }
        var info = new ProcessStartInfo(path) { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var argument in new[] { "--port", port.ToString(CultureInfo.InvariantCulture), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--daemonize", "no" })
        {
            info.ArgumentList.Add(argument);
        }
        var process = Process.Start(info) ?? throw new InvalidOperationException("could not start redis-server");
        process.OutputDataReceived += (_, _) => { };
        process.ErrorDataReceived += (_, _) => { };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        var server = new BenchRedis(process, port);
        var waited = Stopwatch.StartNew();
        while (true)
        {
            try
            {
                if (await server.PingAsync())
                {
                    return server;
                }
            }
            catch (Exception ex) when (ex is SocketException or IOException)
            {
            }
            if (process.HasExited || waited.Elapsed > TimeSpan.FromSeconds(60))
            {
                server.Dispose();
                throw new InvalidOperationException($"redis-server on port {port} did not answer PING (exited: {process.HasExited})");
            }
            await Task.Delay(100);
        }
    }

    private async Task<bool> PingAsync()
    {
        using var client = new TcpClient();
        await client.ConnectAsync(IPAddress.Loopback, Port);
        var stream = client.GetStream();
        await stream.WriteAsync(Encoding.ASCII.GetBytes("PING\r\n"));
        using var reader = new StreamReader(stream, Encoding.ASCII);
        return await reader.ReadLineAsync() == "+PONG";
    }

    public void Dispose()
    {
        AppDomain.CurrentDomain.ProcessExit -= _killAtExit;
        Kill();
        _process.Dispose();
    }

    private void Kill()
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
    }
}
