using System.Buffers;
using System.Text;
using System.Text.Json;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Review;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// <c>opslvp audit verify --db path</c> (docs/cli.md): verifies the audit hash chain of a database file, opened
/// read-only, or of a PostgreSQL database when the value is a connection string (<c>--db "Host=...;Database=..."</c>,
/// read in a read-only transaction). Prints <c>{"entries","ok","first_bad_sequence","reason","detail","time_regression_sequence"}</c>.
/// Exit 0 when the chain verifies, <see cref="ChainBrokenExitCode"/> when it does not, 1 for a missing or
/// unreadable file, 2 for a bad command line (docs/audit.md). <c>opslvp audit verify --export E.json</c> checks the
/// audit entries of an episode export as a chain segment (docs/review.md), same output and exit codes.
/// </summary>
public sealed class AuditVerifyCommand : ICliCommand
{
    /// <summary>Exit code for a database whose chain does not verify.</summary>
    public const int ChainBrokenExitCode = 3;

    public IReadOnlyList<string> Path { get; } = ["audit", "verify"];

    public string Usage => "audit verify --db <file or PostgreSQL connection string> | audit verify --export <episode.json>";

    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        var (option, path) = ParseDb(args);
        var postgres = option == "--db" && !File.Exists(path) && OpsLvpDatabase.LooksLikePostgres(path);
        if (!postgres && !File.Exists(path))
        {
            stderr.WriteLine(option == "--db" ? $"error: database file '{path}' not found" : $"error: episode export '{path}' not found");
            return 1;
        }
        AuditVerification result;
        if (option == "--export")
        {
            try
            {
                result = EpisodeExport.Parse(File.ReadAllText(path)).VerifyAudit();
            }
            catch (FormatException ex)
            {
                stderr.WriteLine($"error: cannot read '{path}' as an episode export: {ex.Message.ReplaceLineEndings(" ")}");
                return 1;
            }
        }
        else if (postgres)
        {
            try
            {
                result = VerifyPostgresAsync(path).GetAwaiter().GetResult();
            }
            catch (Exception ex) when (ex is System.Data.Common.DbException or InvalidDataException or InvalidOperationException or FormatException or InvalidCastException)
            {
                // the connection string may hold a password: name only the server and database
                stderr.WriteLine($"error: cannot read {PostgresName(path)} as an OpsLvp database: {ex.Message.ReplaceLineEndings(" ")}");
                return 1;
            }
        }
        else
        {
            try
            {
                result = VerifyAsync(path).GetAwaiter().GetResult();
            }
            catch (Exception ex) when (ex is SqliteException or InvalidDataException or FormatException or InvalidCastException)
            {
                stderr.WriteLine($"error: cannot read '{path}' as an OpsLvp database: {ex.Message.ReplaceLineEndings(" ")}");
                return 1;
            }
        }

        var buffer = new ArrayBufferWriter<byte>();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteNumber("entries", result.Entries);
            json.WriteBoolean("ok", result.Ok);
            WriteNullable(json, "first_bad_sequence", result.FirstBadSequence);
            if (result.Failure is { } failure)
            {
                json.WriteString("reason", JsonNamingPolicy.SnakeCaseLower.ConvertName(failure.ToString()));
            }
            else
            {
                json.WriteNull("reason");
            }
            json.WriteString("detail", result.Detail);
            WriteNullable(json, "time_regression_sequence", result.FirstTimeRegressionSequence);
            json.WriteEndObject();
        }
        stdout.WriteLine(Encoding.UTF8.GetString(buffer.WrittenSpan));
        return result.Ok ? 0 : ChainBrokenExitCode;
    }

    private static (string Option, string Path) ParseDb(IReadOnlyList<string> args)
    {
        string? option = null;
        string? path = null;
        for (var i = 0; i < args.Count; i++)
        {
            if (args[i] is "--db" or "--export" && i + 1 < args.Count && path is null)
            {
                option = args[i];
                path = args[++i];
            }
            else
            {
                throw new CliUsageException($"unexpected argument '{args[i]}'; usage: opslvp audit verify --db <file> | --export <episode.json>");
            }
        }
        return string.IsNullOrWhiteSpace(path)
            ? throw new CliUsageException("missing --db <file> or --export <episode.json>; usage: opslvp audit verify --db <file> | --export <episode.json>")
            : (option!, path);
    }

    private static async Task<AuditVerification> VerifyAsync(string path)
    {
        var connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = path,
            Mode = SqliteOpenMode.ReadOnly,
            Pooling = false,
        }.ToString();
        var options = OpsLvpDatabase.SqliteOptions(connectionString);
        await using (var db = new OpsLvpDbContext(options))
        {
            var tables = await db.Database
                .SqlQuery<long>($"SELECT count(*) AS \"Value\" FROM sqlite_master WHERE type = 'table' AND name = 'audit_entries'")
                .SingleAsync();
            if (tables == 0)
            {
                throw new InvalidDataException("it has no audit_entries table");
            }
        }
        using var store = new AuditStore(new OpsLvpDbContextFactory(options));
        return await store.VerifyAsync();
    }

    /// <summary>"database 'opslvp' on db:5432", never the password.</summary>
    internal static string PostgresName(string connectionString)
    {
        var builder = new Npgsql.NpgsqlConnectionStringBuilder(connectionString);
        return $"PostgreSQL database '{builder.Database}' on {builder.Host}:{builder.Port}";
    }

    private static async Task<AuditVerification> VerifyPostgresAsync(string connectionString)
    {
        var builder = new Npgsql.NpgsqlConnectionStringBuilder(connectionString)
        {
            Pooling = false,
            // every statement of the check runs read-only: verifying never changes the database
            Options = "-c default_transaction_read_only=on",
        };
        var options = OpsLvpDatabase.PostgresOptions(builder.ConnectionString);
        await using (var db = new OpsLvpDbContext(options))
        {
            var tables = await db.Database
                .SqlQuery<long>($"SELECT count(*) AS \"Value\" FROM information_schema.tables WHERE table_schema = current_schema() AND table_name = 'audit_entries'")
                .SingleAsync();
            if (tables == 0)
            {
                throw new InvalidDataException("it has no audit_entries table");
            }
        }
        using var store = new AuditStore(new OpsLvpDbContextFactory(options));
        return await store.VerifyAsync();
    }

    private static void WriteNullable(Utf8JsonWriter json, string name, long? value)
    {
        if (value is { } v)
        {
            json.WriteNumber(name, v);
        }
        else
        {
            json.WriteNull(name);
        }
    }
}
