using System.Buffers;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Audit.Anchors;
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
/// <para>With <c>--db</c> it also recomputes the readings each entry covers, and with <c>--anchors A.jsonl</c>
/// (optionally <c>--public-key K.pem</c>) it checks the anchors' signatures, the chain against them (truncation,
/// rewriting) and the engine state row's seal; what it finds is listed in <c>anomalies</c> and gives exit
/// <see cref="AnomalyExitCode"/> (docs/audit.md "Verification with anchors").</para>
/// </summary>
public sealed class AuditVerifyCommand : ICliCommand
{
    /// <summary>Exit code for a database whose chain does not verify.</summary>
    public const int ChainBrokenExitCode = 3;

    /// <summary>Exit code for a chain that verifies but whose anchors, state seal or covered readings show tampering.</summary>
    public const int AnomalyExitCode = 4;

    public IReadOnlyList<string> Path { get; } = ["audit", "verify"];

    public string Usage => "audit verify --db <file or PostgreSQL connection string> [--anchors <anchors.jsonl>] [--public-key <key.pem>] [--exports <readings export folder>] | audit verify --export <episode.json>";

    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        var (option, path, anchorsPath, keyPath, exportsPath) = ParseDb(args);
        if (exportsPath is not null && !Directory.Exists(exportsPath))
        {
            stderr.WriteLine($"error: readings export folder '{exportsPath}' not found");
            return 1;
        }
        var postgres = option == "--db" && !File.Exists(path) && OpsLvpDatabase.LooksLikePostgres(path);
        if (!postgres && !File.Exists(path))
        {
            stderr.WriteLine(option == "--db" ? $"error: database file '{path}' not found" : $"error: episode export '{path}' not found");
            return 1;
        }
        IReadOnlyList<string>? anchorLines = null;
        string? trustedFingerprint = null;
        try
        {
            if (anchorsPath is not null)
            {
                anchorLines = File.ReadAllLines(anchorsPath);
            }
            if (keyPath is not null)
            {
                using var key = ECDsa.Create();
                key.ImportFromPem(File.ReadAllText(keyPath));
                trustedFingerprint = AuditAnchor.Fingerprint(Convert.ToBase64String(key.ExportSubjectPublicKeyInfo()));
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or ArgumentException or CryptographicException)
        {
            stderr.WriteLine($"error: cannot read {(anchorLines is null && anchorsPath is not null ? $"anchor log '{anchorsPath}'" : $"public key '{keyPath}'")}: {ex.Message.ReplaceLineEndings(" ")}");
            return 1;
        }
        AuditVerification result;
        DbChecks? checks = null;
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
                (result, checks) = VerifyPostgresAsync(path, anchorLines, trustedFingerprint, exportsPath).GetAwaiter().GetResult();
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
                (result, checks) = VerifyAsync(path, anchorLines, trustedFingerprint, exportsPath).GetAwaiter().GetResult();
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
            if (checks is not null)
            {
                checks.Write(json);
            }
            json.WriteEndObject();
        }
        stdout.WriteLine(Encoding.UTF8.GetString(buffer.WrittenSpan));
        return !result.Ok ? ChainBrokenExitCode : checks is { Anomalies.Count: > 0 } ? AnomalyExitCode : 0;
    }

    private const string UsageText = "usage: opslvp audit verify --db <file> [--anchors <anchors.jsonl>] [--public-key <key.pem>] [--exports <folder>] | --export <episode.json>";

    private static (string Option, string Path, string? Anchors, string? PublicKey, string? Exports) ParseDb(IReadOnlyList<string> args)
    {
        string? exports = null;
        string? option = null;
        string? path = null;
        string? anchors = null;
        string? key = null;
        for (var i = 0; i < args.Count; i++)
        {
            if (args[i] is "--db" or "--export" && i + 1 < args.Count && path is null)
            {
                option = args[i];
                path = args[++i];
            }
            else if (args[i] == "--anchors" && i + 1 < args.Count && anchors is null)
            {
                anchors = args[++i];
            }
            else if (args[i] == "--public-key" && i + 1 < args.Count && key is null)
            {
                key = args[++i];
            }
            else if (args[i] == "--exports" && i + 1 < args.Count && exports is null)
            {
                exports = args[++i];
            }
            else
            {
                throw new CliUsageException($"unexpected argument '{args[i]}'; {UsageText}");
            }
        }
        if (string.IsNullOrWhiteSpace(path))
        {
            throw new CliUsageException($"missing --db <file> or --export <episode.json>; {UsageText}");
        }
        if (option == "--export" && (anchors is not null || key is not null || exports is not null))
        {
            throw new CliUsageException($"--anchors, --public-key and --exports go with --db; {UsageText}");
        }
        if (key is not null && anchors is null)
        {
            throw new CliUsageException($"--public-key needs --anchors; {UsageText}");
        }
        return (option!, path, anchors, key, exports);
    }

    private static async Task<(AuditVerification, DbChecks)> VerifyAsync(string path, IReadOnlyList<string>? anchorLines, string? trustedFingerprint, string? exportsFolder)
    {
        var connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = path,
            Mode = SqliteOpenMode.ReadOnly,
            Pooling = false,
        }.ToString();
        return await VerifyDatabaseAsync(OpsLvpDatabase.SqliteOptions(connectionString), anchorLines, trustedFingerprint, exportsFolder);
    }

    /// <summary>The chain and the other checks (anchors, state seal, covered readings) on an opened database, either provider.</summary>
    private static async Task<(AuditVerification, DbChecks)> VerifyDatabaseAsync(DbContextOptions<OpsLvpDbContext> options, IReadOnlyList<string>? anchorLines, string? trustedFingerprint, string? exportsFolder)
    {
        await using (var db = new OpsLvpDbContext(options))
        {
            if (!await DbChecks.TableExistsAsync(db, "audit_entries"))
            {
                throw new InvalidDataException("it has no audit_entries table");
            }
        }
        var factory = new OpsLvpDbContextFactory(options);
        using var store = new AuditStore(factory);
        var chain = await store.VerifyAsync();
        var checks = await DbChecks.RunAsync(factory, store, anchorLines, trustedFingerprint, exportsFolder);
        return (chain, checks);
    }

    /// <summary>"database 'opslvp' on db:5432", never the password.</summary>
    internal static string PostgresName(string connectionString)
    {
        var builder = new Npgsql.NpgsqlConnectionStringBuilder(connectionString);
        return $"PostgreSQL database '{builder.Database}' on {builder.Host}:{builder.Port}";
    }

    private static async Task<(AuditVerification, DbChecks)> VerifyPostgresAsync(string connectionString, IReadOnlyList<string>? anchorLines, string? trustedFingerprint, string? exportsFolder)
    {
        var builder = new Npgsql.NpgsqlConnectionStringBuilder(connectionString)
        {
            Pooling = false,
            // every statement of the check runs read-only: verifying never changes the database
            Options = "-c default_transaction_read_only=on",
        };
        return await VerifyDatabaseAsync(OpsLvpDatabase.PostgresOptions(builder.ConnectionString), anchorLines, trustedFingerprint, exportsFolder);
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
