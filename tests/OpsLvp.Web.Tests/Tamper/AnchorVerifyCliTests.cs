using System.Text.Json;
using OpsLvp.Cli;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Tests.Persistence;

namespace OpsLvp.Web.Tests.Tamper;

/// <summary>
/// <c>opslvp audit verify</c> on files made here (docs/audit.md "Readings covered", "Verification with anchors"):
/// the covered readings recomputed from the table, and the command line around <c>--anchors</c>. Readings invented.
/// </summary>
public sealed class AnchorVerifyCliTests
{
    private static readonly DateTimeOffset s_t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public async Task CoveredReadings_VerifyUntouched_AndAnEditedOrAddedReadingIsNamedWithItsEntry()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using (var readings = new ReadingStore(temp.Factory))
        using (var audit = new AuditStore(temp.Factory))
        {
            await readings.InsertAsync([Row(0, 900), Row(1, 800)]);
            var first = await readings.CoverAsync(0);
            await audit.AppendAsync([new NewAuditEntry("engine", "transition", first.AddTo("{\"event\":\"transition\"}"), s_t0.AddSeconds(2))]);
            await readings.InsertAsync([Row(3, 500)]);
            var second = await readings.CoverAsync(first.To);
            await audit.AppendAsync([new NewAuditEntry("engine", "transition", second.AddTo("{\"event\":\"transition\"}"), s_t0.AddSeconds(4))]);
            Assert.Equal((0L, 2L, 2L), (first.After, first.To, first.Count));
            Assert.Equal((2L, 3L, 1L), (second.After, second.To, second.Count));
        }

        var (code, output) = Run("audit", "verify", "--db", temp.FilePath);
        Assert.Equal(0, code);
        Assert.Equal(2, output.GetProperty("readings").GetProperty("covering_entries").GetInt64());
        Assert.Equal(3, output.GetProperty("readings").GetProperty("covered_to_id").GetInt64());

        await temp.ExecuteRawAsync("UPDATE readings SET value = 1500 WHERE id = 3;");
        (code, output) = Run("audit", "verify", "--db", temp.FilePath);
        Assert.Equal(4, code);
        var anomaly = Assert.Single(output.GetProperty("anomalies").EnumerateArray());
        Assert.Equal("readings_mismatch", anomaly.GetProperty("kind").GetString());
        Assert.Equal(2, anomaly.GetProperty("sequence").GetInt64());

        await temp.ExecuteRawAsync("UPDATE readings SET value = 500 WHERE id = 3; INSERT INTO readings (time, received_at, source, sensor, kind, value, status, accepted) SELECT time, received_at, source, sensor, kind, 100, status, accepted FROM readings WHERE id = 1;");
        (code, output) = Run("audit", "verify", "--db", temp.FilePath);
        Assert.Equal(0, code); // a row added after the last covering entry is not covered yet ...
        Assert.Equal(1, output.GetProperty("readings").GetProperty("uncovered").GetInt64()); // ... and says so
    }

    [Theory]
    [InlineData("--public-key", "k.pem")]
    [InlineData("--anchors", "a.jsonl", "--anchors", "b.jsonl")]
    public void BadCommandLine_ExitsTwo(params string[] extra)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        Assert.Equal(2, CliApp.Run(["audit", "verify", "--db", "x.db", .. extra], stdout, stderr));
    }

    [Fact]
    public async Task MissingAnchorLog_ExitsOne_NamingIt()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var missing = Path.Combine(temp.Folder, "no-such-anchors.jsonl");

        Assert.Equal(1, CliApp.Run(["audit", "verify", "--db", temp.FilePath, "--anchors", missing], stdout, stderr));
        Assert.Contains(missing, stderr.ToString(), StringComparison.Ordinal);
    }

    private static ReceivedReading Row(int second, double value) =>
        new(s_t0.AddSeconds(second), "push:invented", "s-tdz", "rvr", s_t0.AddSeconds(second), value, "ok", true, null, null);

    private static (int Code, JsonElement Output) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        Assert.True(stdout.ToString().Length > 0, stderr.ToString());
        return (code, JsonDocument.Parse(stdout.ToString()).RootElement.Clone());
    }
}
