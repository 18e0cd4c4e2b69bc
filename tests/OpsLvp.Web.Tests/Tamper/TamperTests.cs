using OpsLvp.FaultCases;
using OpsLvp.Web.Tests.Live;
using Xunit.Abstractions;

namespace OpsLvp.Web.Tests.Tamper;

/// <summary>
/// Every case of <see cref="TamperCases"/> on a folder a real server recorded and stopped: <c>opslvp audit verify</c>
/// with the anchor log and the public key names it (exit 4), and where the start checks it the next start stops the
/// engine naming it (docs/audit.md "Verification with anchors", docs/reliability.md "Tamper evidence").
/// </summary>
public sealed class TamperTests(ITestOutputHelper output)
{
    /// <summary>Every case of the shared list (tests/OpsLvp.FaultCases), so a case added there runs here too.</summary>
    public static TheoryData<string> Names() => new(TamperCases.All.Select(c => c.Name));

    [Theory]
    [MemberData(nameof(Names))]
    public async Task Case_IsReportedByVerify_AndStopsTheEngineWhereTheStartChecksIt(string name)
    {
        var tamper = TamperCases.Named(name);
        await using var folder = await TamperedFolder.RecordAsync();
        var (before, beforeOutput, _) = folder.Verify();
        Assert.True(before == 0, $"untouched recording: exit {before}: {beforeOutput}");
        Assert.True(beforeOutput.GetProperty("anchors").GetProperty("valid").GetInt32() >= 1);
        Assert.True(beforeOutput.GetProperty("readings").GetProperty("covering_entries").GetInt64() >= 2);
        Assert.Equal("ok", beforeOutput.GetProperty("state_seal").GetString());

        await tamper.Apply(folder);

        var (code, verified, stderr) = folder.Verify();
        output.WriteLine($"{name}: exit {code}: {verified}");
        Assert.True(verified.ValueKind == System.Text.Json.JsonValueKind.Object, stderr);
        var kinds = verified.GetProperty("anomalies").EnumerateArray().Select(a => a.GetProperty("kind").GetString()).ToList();
        if (tamper.Anomaly is null)
        {
            Assert.Equal(0, code);
            Assert.Empty(kinds);
            Assert.True(verified.GetProperty("ok").GetBoolean());
            Assert.Equal(System.Text.Json.JsonValueKind.Null, verified.GetProperty("time_regression_sequence").ValueKind);
        }
        else
        {
            Assert.True(code == 4, $"exit {code}: {verified}");
            Assert.True(verified.GetProperty("ok").GetBoolean()); // the chain alone verifies: only the anchors, seal or digests show it
            Assert.Contains(tamper.Anomaly, kinds);
        }

        await using var restarted = folder.Start();
        var health = await restarted.GetHealthAsync();
        var engine = health.GetProperty("engine");
        if (tamper.StopText is null)
        {
            Assert.Equal("ok", health.GetProperty("status").GetString());
        }
        else
        {
            Assert.Equal("failing", health.GetProperty("status").GetString());
            var stopped = engine.GetProperty("stopped").GetString();
            output.WriteLine($"{name}: stopped: {stopped}");
            Assert.Contains(tamper.StopText, stopped, StringComparison.Ordinal);
            Assert.Contains("Engine:AcknowledgeStateMismatch=", stopped, StringComparison.Ordinal);
        }
    }

    [Fact]
    public async Task AcknowledgedTruncation_IsAudited_AndLaterStartsAreClean()
    {
        await using var folder = await TamperedFolder.RecordAsync();
        await TamperCases.Named("delete_last_entries").Apply(folder);
        var head = (long)(await folder.SqlAsync("SELECT MAX(sequence) FROM audit_entries;"))!;

        await using (var acknowledged = folder.Start(new Dictionary<string, string?> { ["Engine:AcknowledgeStateMismatch"] = head.ToString(System.Globalization.CultureInfo.InvariantCulture) }))
        {
            Assert.Equal("ok", (await acknowledged.GetHealthAsync()).GetProperty("status").GetString());
            var entries = await LiveClient.EntriesAsync(acknowledged);
            var ack = Assert.Single(entries, e => e.Kind == "state_mismatch_acknowledged");
            Assert.Contains("were removed", ack.PayloadJson, StringComparison.Ordinal);
        }
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();

        // the reset anchor written after the acknowledgement sets the earlier anchors aside: the next start runs
        await using (var next = folder.Start())
        {
            Assert.Equal("ok", (await next.GetHealthAsync()).GetProperty("status").GetString());
        }
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        var (code, verified, _) = folder.Verify();
        Assert.True(code == 0, verified.ToString());
    }
}
