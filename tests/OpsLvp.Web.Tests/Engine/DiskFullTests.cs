using System.Net;
using System.Text.Json;
using OpsLvp.FaultCases;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The real app on a data folder that is a small tmpfs, filled up while readings are pushed, then freed
/// (docs/reliability.md "Storage faults"). Readings are invented.
/// </summary>
public sealed class DiskFullTests
{
    private const int BatchSize = 100;

    [RootFact]
    public async Task DiskFull_RefusesPushesWith503_FailsHealth_SaysNotRecording_ThenRecordsOneGap_AndLosesNoAcknowledgedReading()
    {
        using var fs = SmallMount.Mount(OpsLvpApp.NewDataFolder(), 24);
        var profile = LiveTestProfile.Write(fs.Root);
        await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(profile), fs.Root);
        await LiveClient.ReaderKeyAsync(app); // issued (an audit entry) while there is room
        var pusher = new BatchPusher(app, DateTimeOffset.UtcNow.AddSeconds(-90), BatchSize);

        for (var i = 0; i < 3; i++)
        {
            var (status, _) = await pusher.PushBatchAsync();
            Assert.Equal(HttpStatusCode.Accepted, status);
        }

        fs.Fill();
        string? refusal = null;
        for (var i = 0; i < 600 && refusal is null; i++)
        {
            var (status, error) = await pusher.PushBatchAsync();
            if (status == HttpStatusCode.ServiceUnavailable)
            {
                refusal = error;
            }
            else
            {
                Assert.Equal(HttpStatusCode.Accepted, status);
            }
        }
        Assert.NotNull(refusal);
        Assert.StartsWith("not stored, retry later:", refusal, StringComparison.Ordinal);

        var health = await app.GetHealthAsync();
        Assert.Equal("failing", health.GetProperty("status").GetString());
        Assert.NotEqual(JsonValueKind.Null, health.GetProperty("engine").GetProperty("notRecordingSince").ValueKind);
        var state = await LiveClient.StateAsync(app);
        var recording = state.GetProperty("recording");
        Assert.False(recording.GetProperty("recording").GetBoolean());
        Assert.NotEqual(JsonValueKind.Null, recording.GetProperty("since").ValueKind);
        Assert.Contains(state.GetProperty("status").GetProperty("alarms").EnumerateArray(), a => a.GetProperty("kind").GetString() == "auditStorageFailing");
        // still full: still refused
        Assert.Equal(HttpStatusCode.ServiceUnavailable, (await pusher.PushBatchAsync()).Status);

        fs.Free();
        await pusher.PushUntilAcceptedAsync("space returning");
        Assert.Equal("ok", (await app.GetHealthAsync()).GetProperty("status").GetString());
        // the published state follows the host's flag with the next publish (coalesced, docs/feeds.md): give it room
        var stateDeadline = DateTime.UtcNow.AddSeconds(30);
        while (!(await LiveClient.StateAsync(app)).GetProperty("recording").GetProperty("recording").GetBoolean())
        {
            Assert.True(DateTime.UtcNow < stateDeadline, "/api/state still says not recording 30 s after health said ok");
            await Task.Delay(200);
        }

        // every acknowledged reading is in the readings table
        var lost = await pusher.LostAsync();
        Assert.True(lost.Count == 0, $"{lost.Count} of {pusher.Acknowledged.Count} acknowledged readings were not stored");

        // the gap is one entry naming its start and end, and nothing else is dated inside it
        var entries = await LiveClient.EntriesAsync(app);
        var gap = Assert.Single(entries, e => e.Kind == "recording_gap");
        using var payload = JsonDocument.Parse(gap.PayloadJson);
        var from = payload.RootElement.GetProperty("from").GetDateTimeOffset();
        var to = payload.RootElement.GetProperty("to").GetDateTimeOffset();
        Assert.True(from < to, $"gap from {from:o} to {to:o}");
        Assert.DoesNotContain(entries, e => e.Time > from && e.Time < to);
        Assert.True(payload.RootElement.GetProperty("refusedReadings").GetInt64() >= BatchSize);
        await LiveClient.AssertChainVerifiesAsync(app);
    }
}
