using System.Diagnostics;
using System.Net;
using System.Net.Sockets;

namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>
/// Finds the database and cache servers the tests start for themselves (Debian's <c>postgresql</c> and
/// <c>redis-server</c>) and says why a test cannot run without them. With <c>OPSLVP_REQUIRE_SERVICES=1</c> (set by
/// <c>.ci/run</c>) a missing server fails the tests instead of skipping them.
/// </summary>
public static class LocalServices
{
    public const string RequireVariable = "OPSLVP_REQUIRE_SERVICES";

    /// <summary>Folder of PostgreSQL's server programs (<c>initdb</c>, <c>pg_ctl</c>); <c>OPSLVP_PG_BIN</c> overrides.</summary>
    public static string? PostgresBin { get; } = FindPostgresBin();

    /// <summary>Path of <c>redis-server</c>; <c>OPSLVP_REDIS_SERVER</c> overrides.</summary>
    public static string? RedisServer { get; } = FindRedisServer();

    public static bool Required => Environment.GetEnvironmentVariable(RequireVariable) == "1";

    /// <summary>Null when PostgreSQL tests can run (or must, under <see cref="RequireVariable"/>); else why they are skipped.</summary>
    public static string? PostgresSkipReason =>
        PostgresBin is null && !Required
            ? "PostgreSQL server programs not found (apt install postgresql, or set OPSLVP_PG_BIN); set OPSLVP_REQUIRE_SERVICES=1 to fail instead"
            : null;

    /// <summary>Null when Redis tests can run (or must); else why they are skipped.</summary>
    public static string? RedisSkipReason =>
        RedisServer is null && !Required
            ? "redis-server not found (apt install redis-server, or set OPSLVP_REDIS_SERVER); set OPSLVP_REQUIRE_SERVICES=1 to fail instead"
            : null;

    /// <summary>A TCP port on 127.0.0.1 that was free a moment ago (the OS picks it).</summary>
    public static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        return port;
    }

    /// <summary>
    /// A port on 127.0.0.1 that refuses connections for as long as the returned socket is kept: bound, never listening.
    /// A port from <see cref="FreePort"/> is free only for a moment, and a server another test starts meanwhile may take it.
    /// </summary>
    public static Socket RefusingPort(out int port)
    {
        var socket = new Socket(AddressFamily.InterNetwork, SocketType.Stream, ProtocolType.Tcp);
        socket.Bind(new IPEndPoint(IPAddress.Loopback, 0));
        port = ((IPEndPoint)socket.LocalEndPoint!).Port;
        return socket;
    }

    /// <summary>Runs a program to its end; throws with its output when it fails.</summary>
    public static string Run(string program, IEnumerable<string> arguments, TimeSpan? timeout = null)
    {
        var info = new ProcessStartInfo(program) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var argument in arguments)
        {
            info.ArgumentList.Add(argument);
        }
        using var process = Process.Start(info) ?? throw new InvalidOperationException($"could not start {program}");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(timeout ?? TimeSpan.FromSeconds(120)))
        {
            process.Kill(entireProcessTree: true);
            throw new InvalidOperationException($"{program} {string.Join(' ', info.ArgumentList)} did not finish in time");
        }
        var output = stdout.Result + stderr.Result;
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"{program} {string.Join(' ', info.ArgumentList)} exited with {process.ExitCode}: {output}");
        }
        return output;
    }

    private static string? FindPostgresBin()
    {
        var configured = Environment.GetEnvironmentVariable("OPSLVP_PG_BIN");
        if (!string.IsNullOrWhiteSpace(configured))
        {
            return File.Exists(Path.Combine(configured, "initdb")) ? configured : null;
        }
        const string root = "/usr/lib/postgresql";
        if (!Directory.Exists(root))
        {
            return null;
        }
        return Directory.GetDirectories(root)
            .Select(d => Path.Combine(d, "bin"))
            .Where(d => File.Exists(Path.Combine(d, "initdb")) && File.Exists(Path.Combine(d, "pg_ctl")))
            .OrderByDescending(d => int.TryParse(Path.GetFileName(Path.GetDirectoryName(d)), out var major) ? major : 0)
            .FirstOrDefault();
    }

    private static string? FindRedisServer()
    {
        var configured = Environment.GetEnvironmentVariable("OPSLVP_REDIS_SERVER");
        if (!string.IsNullOrWhiteSpace(configured))
        {
            return File.Exists(configured) ? configured : null;
        }
        return new[] { "/usr/bin/redis-server", "/usr/local/bin/redis-server" }.FirstOrDefault(File.Exists);
    }
}
