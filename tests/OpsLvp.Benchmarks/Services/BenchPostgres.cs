using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using Npgsql;

namespace OpsLvp.Benchmarks.Services;

/// <summary>
/// A throwaway PostgreSQL cluster for a benchmark run, the same recipe as the tests' <c>PostgresCluster</c>
/// (tests/OpsLvp.Web.Tests/Infrastructure/Services, not referenced so xunit stays out): <c>initdb</c> in a temporary
/// folder (trust, user <c>opslvp</c>), the server on a free port of 127.0.0.1, as the <c>postgres</c> user under root,
/// <c>fsync</c> and <c>synchronous_commit</c> at their durable defaults; stopped and deleted when the process ends.
/// </summary>
public sealed class BenchPostgres
{
    private static readonly Lazy<BenchPostgres> s_shared = new(Start, LazyThreadSafetyMode.ExecutionAndPublication);

    private BenchPostgres(string folder, int port)
    {
        Folder = folder;
        Port = port;
    }

    /// <exception cref="InvalidOperationException">No PostgreSQL programs, or the cluster did not start.</exception>
    public static BenchPostgres Shared => s_shared.Value;

    public string Folder { get; }

    public int Port { get; }

    public string ConnectionString(string database) =>
        new NpgsqlConnectionStringBuilder { Host = "127.0.0.1", Port = Port, Username = "opslvp", Database = database }.ConnectionString;

    public string CreateDatabase()
    {
        var name = "opslvp_bench_" + Guid.NewGuid().ToString("N");
        using var connection = new NpgsqlConnection(ConnectionString("postgres") + ";Pooling=false");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = $"CREATE DATABASE \"{name}\"";
        command.ExecuteNonQuery();
        return ConnectionString(name);
    }

    /// <summary>The folder of <c>initdb</c> and <c>pg_ctl</c> (<c>OPSLVP_PG_BIN</c>, else the newest under /usr/lib/postgresql), or null.</summary>
    public static string? FindBin()
    {
        var configured = Environment.GetEnvironmentVariable("OPSLVP_PG_BIN");
        if (!string.IsNullOrWhiteSpace(configured))
        {
            return File.Exists(Path.Combine(configured, "initdb")) ? configured : null;
        }
        const string root = "/usr/lib/postgresql";
        return !Directory.Exists(root) ? null : Directory.GetDirectories(root)
            .Select(d => Path.Combine(d, "bin"))
            .Where(d => File.Exists(Path.Combine(d, "initdb")) && File.Exists(Path.Combine(d, "pg_ctl")))
            .OrderByDescending(d => int.TryParse(Path.GetFileName(Path.GetDirectoryName(d)), out var major) ? major : 0)
            .FirstOrDefault();
    }

    private static BenchPostgres Start()
    {
        var bin = FindBin() ?? throw new InvalidOperationException("PostgreSQL server programs not found (apt install postgresql, or set OPSLVP_PG_BIN)");
        var asPostgres = Environment.IsPrivilegedProcess;
        var folder = Directory.CreateTempSubdirectory("opslvp-benchpg-").FullName;
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        var data = Path.Combine(folder, "data");
        void Tool(string tool, params string[] arguments)
        {
            var path = Path.Combine(bin, tool);
            if (asPostgres)
            {
                Run("runuser", ["-u", "postgres", "--", path, .. arguments]);
            }
            else
            {
                Run(path, arguments);
            }
        }
        if (asPostgres)
        {
            Run("chown", ["postgres:", folder]);
        }
        Tool("initdb", "-D", data, "-U", "opslvp", "-A", "trust", "-E", "UTF8", "--no-locale", "--no-sync");
        Tool("pg_ctl", "start", "-D", data, "-l", Path.Combine(folder, "server.log"), "-w", "-t", "120",
            "-o", $"-p {port} -k {folder} -c listen_addresses=127.0.0.1 -c max_connections=100 -c shared_buffers=128MB");
        var stop = $"'{Path.Combine(bin, "pg_ctl")}' stop -D '{data}' -m fast -w -t 60";
        if (asPostgres)
        {
            stop = "runuser -u postgres -- " + stop;
        }
        AppDomain.CurrentDomain.ProcessExit += (_, _) =>
        {
            using var shell = Process.Start("sh", ["-c", $"{stop} >/dev/null 2>&1; rm -rf '{folder}'"]);
            shell.WaitForExit(30_000);
        };
        return new BenchPostgres(folder, port);
    }

    private static void Run(string program, IEnumerable<string> arguments)
    {
        var info = new ProcessStartInfo(program) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in arguments)
        {
            info.ArgumentList.Add(a);
        }
        using var process = Process.Start(info) ?? throw new InvalidOperationException($"could not start {program}");
        var output = process.StandardOutput.ReadToEndAsync();
        var error = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromSeconds(180)))
        {
            process.Kill(entireProcessTree: true);
            throw new InvalidOperationException($"{program} did not finish in time");
        }
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"{program} {string.Join(' ', info.ArgumentList)} exited with {process.ExitCode}: {output.Result}{error.Result}");
        }
    }
}
