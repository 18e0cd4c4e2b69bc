using Microsoft.Data.Sqlite;
using OpsLvp.Cli;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Tamper;

/// <summary>
/// docs/engine.md R79, docs/audit.md "Readings covered": readings stored with no transition or engine event to cover
/// them get a <c>readings_covered</c> entry once <c>Engine:ReadingsCoverInterval</c> has passed; nothing stored, no
/// entry. Real server, real SQLite file, real CLI. The readings (RVR well above the invented test profile's
/// thresholds, so no transition) are invented.
/// </summary>
public sealed class ReadingsCoverIntervalTests
{
    private static readonly TimeSpan s_deadline = TimeSpan.FromSeconds(60);

    [Fact]
    public async Task QuietReadings_AreCoveredEachInterval_NotWhenNoneArrive_AndAnEditShowsInVerify()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
            settings["Engine:ReadingsCoverInterval"] = "00:00:02";
            var database = Path.Combine(folder, EngineServiceCollectionExtensions.DatabaseFileName);
            ReadingsCoverage first;
            ReadingsCoverage second;
            long secondSequence;
            await using (var app = OpsLvpApp.Start(settings, folder))
            {
                var audit = LiveClient.Audit(app);
                // the sensor's first reading may raise engine events, which cover it themselves
                await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-2), LiveTestProfile.Tdz, "rvr", 1500));
                await Task.Delay(500);
                await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 1450));
                var (entry1, cover1) = await WaitForCoverEntryAsync(audit, 0);
                // A first reading that raises no event of its own is covered at once when the start was more than an
                // interval ago (a slow start), leaving the second one for the next window, which would then also hold
                // the two below: take the covering entries until the one that covers every reading pushed so far.
                var pushed = await MaxIdAsync(database);
                while (cover1.To < pushed)
                {
                    (entry1, cover1) = await WaitForCoverEntryAsync(audit, entry1.Sequence);
                }
                first = cover1;
                Assert.Equal(PreviousCoverTo(await AllAsync(audit), entry1.Sequence), first.After);
                Assert.Equal(await CountAsync(database, first.After, first.To), first.Count);
                Assert.True(first.Count >= 1, "the pushed reading is in the first window");

                await LiveClient.PushAsync(app,
                    LiveClient.Item(DateTimeOffset.UtcNow.AddMilliseconds(-500), LiveTestProfile.Tdz, "rvr", 1400),
                    LiveClient.Item(DateTimeOffset.UtcNow.AddMilliseconds(-400), LiveTestProfile.Tdz, "rvr", 1300));
                var (entry2, cover2) = await WaitForCoverEntryAsync(audit, entry1.Sequence);
                second = cover2;
                secondSequence = entry2.Sequence;
                Assert.Equal(first.To, second.After); // contiguous: exactly the readings since the previous one
                Assert.Equal(2, second.Count);
                Assert.Equal(second.Count, await CountAsync(database, second.After, second.To));
                Assert.Equal(0, await CountAsync(database, second.To, long.MaxValue));

                // nothing stored: several intervals pass with no covering entry (absence can only be shown by waiting)
                var head = (await audit.GetHeadAsync())!.Sequence;
                await Task.Delay(TimeSpan.FromSeconds(7));
                Assert.DoesNotContain(await AllAsync(audit), e => e.Sequence > head && e.Kind == AuditEvents.ReadingsCovered);
            }
            SqliteConnection.ClearAllPools();

            var (code, output) = Verify(database);
            Assert.True(code == 0, output);
            Assert.Contains("\"uncovered\":0", output, StringComparison.Ordinal);

            await ExecAsync(database, $"UPDATE readings SET value = 1350 WHERE id = {second.To}");
            (code, output) = Verify(database);
            Assert.Equal(4, code);
            Assert.Contains("readings_mismatch", output, StringComparison.Ordinal);
            Assert.Contains($"\"sequence\":{secondSequence}", output, StringComparison.Ordinal);
            Assert.Contains("(readings_covered)", output, StringComparison.Ordinal);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task<List<AuditEntry>> AllAsync(AuditStore audit)
    {
        var head = (await audit.GetHeadAsync())?.Sequence ?? 0;
        return [.. await audit.GetRangeAsync(1, head)];
    }

    private static long PreviousCoverTo(List<AuditEntry> entries, long before) =>
        entries.Where(e => e.Sequence < before).Select(e => ReadingsCoverage.From(e.PayloadJson)).LastOrDefault(c => c is not null)?.To ?? 0;

    private static async Task<(AuditEntry Entry, ReadingsCoverage Cover)> WaitForCoverEntryAsync(AuditStore audit, long after)
    {
        var until = DateTimeOffset.UtcNow + s_deadline;
        while (true)
        {
            var found = (await AllAsync(audit)).FirstOrDefault(e => e.Sequence > after && e.Kind == AuditEvents.ReadingsCovered);
            if (found is not null)
            {
                var cover = ReadingsCoverage.From(found.PayloadJson);
                Assert.NotNull(cover);
                return (found, cover);
            }
            Assert.True(DateTimeOffset.UtcNow < until, $"no {AuditEvents.ReadingsCovered} entry after audit entry {after} within {s_deadline}: {string.Join(", ", (await AllAsync(audit)).Select(e => $"{e.Sequence} {e.Kind} {e.PayloadJson[..Math.Min(120, e.PayloadJson.Length)]}"))}");
            await Task.Delay(200);
        }
    }

    private static async Task<long> CountAsync(string database, long after, long to)
    {
        await using var connection = new SqliteConnection($"Data Source={database};Mode=ReadOnly;Pooling=False");
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = "SELECT COUNT(*) FROM readings WHERE id > $a AND id <= $b";
        command.Parameters.AddWithValue("$a", after);
        command.Parameters.AddWithValue("$b", to);
        return (long)(await command.ExecuteScalarAsync())!;
    }

    private static async Task<long> MaxIdAsync(string database)
    {
        await using var connection = new SqliteConnection($"Data Source={database};Mode=ReadOnly;Pooling=False");
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = "SELECT MAX(id) FROM readings";
        return (long)(await command.ExecuteScalarAsync())!;
    }

    private static async Task ExecAsync(string database, string sql)
    {
        await using var connection = new SqliteConnection($"Data Source={database};Pooling=False");
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        Assert.Equal(1, await command.ExecuteNonQueryAsync());
    }

    private static (int Code, string Output) Verify(string database)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(["audit", "verify", "--db", database], stdout, stderr);
        return (code, stdout + stderr.ToString());
    }
}
