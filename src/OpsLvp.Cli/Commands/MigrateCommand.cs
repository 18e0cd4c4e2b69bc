using System.Buffers;
using System.Data.Common;
using System.Text;
using System.Text.Json;
using OpsLvp.Data;
using OpsLvp.Data.Copy;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// <c>opslvp migrate --from &lt;sqlite file&gt; --to &lt;PostgreSQL connection string&gt;</c> (docs/cli.md,
/// docs/deployment.md): copies an installation into an empty PostgreSQL database (<see cref="SqliteToPostgresCopy"/>)
/// and verifies the audit chain there. Prints <c>{"ok","tables":{name:rows},"entries","head_hash","first_bad_sequence","detail"}</c>.
/// Exit 0 when the target's chain verifies and ends on the source's head, 3 when it does not, 1 for a missing or
/// unreadable source, a source whose chain is broken, a target that is not empty or cannot be reached (nothing is
/// committed), 2 for a bad command line.
/// </summary>
public sealed class MigrateCommand : ICliCommand
{
    private const string UsageText = "migrate --from <sqlite file> --to <PostgreSQL connection string>";

    public IReadOnlyList<string> Path { get; } = ["migrate"];

    public string Usage => UsageText;

    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        var (from, to) = Parse(args);
        if (!OpsLvpDatabase.LooksLikePostgres(to))
        {
            throw new CliUsageException($"--to must be a PostgreSQL connection string such as 'Host=db;Database=opslvp;Username=opslvp;Password=...'; usage: opslvp {UsageText}");
        }
        var target = AuditVerifyCommand.PostgresName(to);
        DatabaseCopyResult result;
        try
        {
            result = SqliteToPostgresCopy.CopyAsync(from, to).GetAwaiter().GetResult();
        }
        catch (Exception ex) when (ex is DbException or InvalidDataException or InvalidOperationException or FormatException or InvalidCastException)
        {
            stderr.WriteLine($"error: nothing copied from '{from}' to {target}: {ex.Message.ReplaceLineEndings(" ")}");
            return 1;
        }

        var buffer = new ArrayBufferWriter<byte>();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteBoolean("ok", result.Ok);
            json.WriteStartObject("tables");
            foreach (var (table, rows) in result.Rows)
            {
                json.WriteNumber(table, rows);
            }
            json.WriteEndObject();
            json.WriteNumber("entries", result.TargetVerification.Entries);
            json.WriteString("head_hash", result.TargetHeadHash);
            if (result.TargetVerification.FirstBadSequence is { } bad)
            {
                json.WriteNumber("first_bad_sequence", bad);
            }
            else
            {
                json.WriteNull("first_bad_sequence");
            }
            json.WriteString("detail", result.TargetVerification.Detail);
            json.WriteEndObject();
        }
        stdout.WriteLine(Encoding.UTF8.GetString(buffer.WrittenSpan));
        if (!result.Ok)
        {
            stderr.WriteLine($"error: the copy on {target} does not verify or does not end on the source's head");
        }
        return result.Ok ? 0 : AuditVerifyCommand.ChainBrokenExitCode;
    }

    private static (string From, string To) Parse(IReadOnlyList<string> args)
    {
        string? from = null;
        string? to = null;
        for (var i = 0; i < args.Count; i++)
        {
            if (args[i] == "--from" && i + 1 < args.Count && from is null)
            {
                from = args[++i];
            }
            else if (args[i] == "--to" && i + 1 < args.Count && to is null)
            {
                to = args[++i];
            }
            else
            {
                throw new CliUsageException($"unexpected argument '{args[i]}'; usage: opslvp {UsageText}");
            }
        }
        if (string.IsNullOrWhiteSpace(from) || string.IsNullOrWhiteSpace(to))
        {
            throw new CliUsageException($"missing --from or --to; usage: opslvp {UsageText}");
        }
        return (from, to);
    }
}
