using System.Globalization;
using Npgsql;

namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>
/// A throwaway PostgreSQL cluster for the test run: <c>initdb</c> in a temporary folder (trust authentication, user
/// <c>opslvp</c>), the server on a free port of 127.0.0.1 with its unix socket in the same folder, stopped and deleted
/// when the test process ends. PostgreSQL refuses to run as root, so under root the programs run as the
/// <c>postgres</c> user of the Debian package (<c>runuser -u postgres</c>). Each test takes a database of its own
/// (<see cref="CreateDatabase"/>); <c>fsync</c> and <c>synchronous_commit</c> stay at their durable defaults, as the
/// app checks them.
/// </summary>
public sealed class PostgresCluster : IDisposable
{
    private const string User = "opslvp";

    private static readonly Lazy<PostgresCluster> s_shared = new(StartShared, LazyThreadSafetyMode.ExecutionAndPublication);

    private readonly string _bin;
    private readonly bool _asPostgresUser;
    private bool _stopped;

    private PostgresCluster(string bin, string folder, int port, bool asPostgresUser)
    {
        _bin = bin;
        Folder = folder;
        Port = port;
        _asPostgresUser = asPostgresUser;
    }

    /// <summary>The cluster of this test process, started on first use.</summary>
    /// <exception cref="InvalidOperationException">The server programs are missing or the cluster did not start (the message says why).</exception>
    public static PostgresCluster Shared => s_shared.Value;

    public string Folder { get; }

    public int Port { get; }

    private string DataFolder => Path.Combine(Folder, "data");

    /// <summary>A connection string for <paramref name="database"/> on this cluster (TCP on 127.0.0.1).</summary>
    public string ConnectionString(string database) => new NpgsqlConnectionStringBuilder
    {
        Host = "127.0.0.1",
        Port = Port,
        Username = User,
        Database = database,
        IncludeErrorDetail = true,
    }.ConnectionString;

    /// <summary>Creates an empty database with a fresh name and returns its connection string.</summary>
    public string CreateDatabase()
    {
        var name = "opslvp_test_" + Guid.NewGuid().ToString("N");
        using var connection = new NpgsqlConnection(ConnectionString("postgres") + ";Pooling=false");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = $"CREATE DATABASE \"{name}\"";
        command.ExecuteNonQuery();
        return ConnectionString(name);
    }

    /// <summary>Ends every server process serving <paramref name="connectionString"/>'s database (a dropped connection, as a network cut or a server restart gives).</summary>
    public int TerminateConnections(string connectionString)
    {
        var database = new NpgsqlConnectionStringBuilder(connectionString).Database;
        using var connection = new NpgsqlConnection(ConnectionString("postgres") + ";Pooling=false");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = "SELECT count(pg_terminate_backend(pid)) FROM pg_stat_activity WHERE datname = @d AND pid <> pg_backend_pid()";
        command.Parameters.AddWithValue("d", database ?? "");
        return Convert.ToInt32(command.ExecuteScalar(), CultureInfo.InvariantCulture);
    }

    public void Dispose()
    {
        if (_stopped)
        {
            return;
        }
        _stopped = true;
        // Stop and delete in one detached shell: this runs from ProcessExit, and the test host can be ended before a
        // deletion in this process finishes (the shell carries on; waiting for it here is a courtesy).
        var pgCtl = Path.Combine(_bin, "pg_ctl");
        var stop = $"'{pgCtl}' stop -D '{DataFolder}' -m immediate -w -t 60";
        if (_asPostgresUser)
        {
            stop = "runuser -u postgres -- " + stop;
        }
        try
        {
            using var shell = System.Diagnostics.Process.Start("sh", ["-c", $"{stop} >/dev/null 2>&1; rm -rf '{Folder}'"]);
            shell.WaitForExit(30_000);
        }
        catch (System.ComponentModel.Win32Exception)
        {
            TryDeleteFolder(Folder);
        }
    }

    private static PostgresCluster StartShared()
    {
        var bin = LocalServices.PostgresBin
            ?? throw new InvalidOperationException("PostgreSQL server programs not found (apt install postgresql, or set OPSLVP_PG_BIN); OPSLVP_REQUIRE_SERVICES=1 is set, so the test fails instead of being skipped");
        var asPostgresUser = Environment.IsPrivilegedProcess;
        DeleteLeftovers();
        // the port was free when it was picked; a server another test (or test process) started meanwhile may have taken
        // it, and then this one cannot listen: a new cluster on a new port, a few times
        for (var attempt = 1; ; attempt++)
        {
            try
            {
                var cluster = StartOnFreePort(bin, asPostgresUser);
                AppDomain.CurrentDomain.ProcessExit += (_, _) => cluster.Dispose();
                return cluster;
            }
            catch (PortTakenException) when (attempt < 3)
            {
            }
        }
    }

    private static PostgresCluster StartOnFreePort(string bin, bool asPostgresUser)
    {
        var folder = Directory.CreateTempSubdirectory("opslvp-pg-").FullName;
        var cluster = new PostgresCluster(bin, folder, LocalServices.FreePort(), asPostgresUser);
        try
        {
            if (asPostgresUser)
            {
                LocalServices.Run("chown", ["postgres:", folder]);
            }
            cluster.RunTool("initdb", "-D", cluster.DataFolder, "-U", User, "-A", "trust", "-E", "UTF8", "--no-locale", "--no-sync");
            cluster.RunTool("pg_ctl", "start", "-D", cluster.DataFolder, "-l", Path.Combine(folder, "server.log"), "-w", "-t", "120",
                "-o", $"-p {cluster.Port} -k {folder} -c listen_addresses=127.0.0.1 -c max_connections=300 -c shared_buffers=32MB");
            return cluster;
        }
        catch (Exception ex)
        {
            var log = Path.Combine(folder, "server.log");
            var tail = File.Exists(log) ? File.ReadAllText(log) : "";
            cluster.Dispose();
            var message = $"the test PostgreSQL cluster did not start: {ex.Message} {tail}";
            throw tail.Contains("Address already in use", StringComparison.Ordinal)
                ? new PortTakenException(message, ex)
                : new InvalidOperationException(message, ex);
        }
    }

    private sealed class PortTakenException(string message, Exception inner) : InvalidOperationException(message, inner);

    /// <summary>Deletes clusters of earlier runs that were not stopped cleanly and no longer run (no postmaster.pid).</summary>
    private static void DeleteLeftovers()
    {
        foreach (var folder in Directory.GetDirectories(Path.GetTempPath(), "opslvp-pg-*"))
        {
            if (!File.Exists(Path.Combine(folder, "data", "postmaster.pid")) && Directory.GetLastWriteTimeUtc(folder) < DateTime.UtcNow.AddMinutes(-10))
            {
                TryDeleteFolder(folder);
            }
        }
    }

    // Its own, not OpsLvpApp's: this file is shared as source with tests/OpsLvp.EndToEnd.Tests, which has no OpsLvpApp.
    private static void TryDeleteFolder(string folder)
    {
        try
        {
            Directory.Delete(folder, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    private void RunTool(string tool, params string[] arguments)
    {
        var path = Path.Combine(_bin, tool);
        if (_asPostgresUser)
        {
            LocalServices.Run("runuser", ["-u", "postgres", "--", path, .. arguments]);
        }
        else
        {
            LocalServices.Run(path, arguments);
        }
    }
}
