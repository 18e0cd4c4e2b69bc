using System.Globalization;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// Entry point of this test assembly when run as a child process by <see cref="CrashRecoveryTests"/>:
/// <c>crash-writer &lt;db file&gt;</c> appends one audit entry with its engine state per commit, forever, and prints
/// each committed sequence on its own line, so the parent can kill it (SIGKILL) at an arbitrary moment.
/// Without those arguments it does nothing (the test runner does not use this entry point).
/// </summary>
internal static class CrashWriterProgram
{
    public static async Task<int> Main(string[] args)
    {
        if (args.Length != 2 || args[0] != "crash-writer")
        {
            return 0;
        }
        var options = OpsLvpDatabase.SqliteOptions($"Data Source={args[1]}");
        using var store = new AuditStore(new OpsLvpDbContextFactory(options));
        var start = DateTimeOffset.UnixEpoch.AddYears(56);
        while (true)
        {
            var next = ((await store.GetHeadAsync())?.Sequence ?? 0) + 1;
            var time = start.AddSeconds(next);
            var payload = string.Create(CultureInfo.InvariantCulture, $"{{\"n\":{next}}}");
            var committed = await store.AppendAsync(
                [new NewAuditEntry("crash.writer", "tick", payload, time)],
                new EngineStateWrite(payload, "invented-1", time));
            Console.Out.WriteLine(committed[^1].Sequence.ToString(CultureInfo.InvariantCulture));
            Console.Out.Flush();
        }
    }
}
