using System.Net;
using System.Text.Json;
using OpsLvp.FaultCases;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The data folder turns read-only under the running app (a read-only bind mount over it, on a small tmpfs), then
/// writable again (docs/reliability.md "Storage faults", "Read-only data folder"). Readings are invented.
/// </summary>
public sealed class ReadOnlyFolderTests
{
    private const int BatchSize = 50;

    /// <remarks>
    /// Files the server already holds open stay writable through their descriptors, so its kept writer connections
    /// could go on recording into a folder that could not be opened again at the next start. Each write first opens
    /// the probe file beside the database for writing (SqliteWriter), so from the first push after the folder turned
    /// read-only the server stops recording, whichever connection would have taken the push.
    /// </remarks>
    [RootFact]
    public async Task ReadOnlyDataFolder_EveryPushIs503WithAReason_HealthSaysNotRecording_ThenOneGapEntry_AndEveryAcknowledgedReadingStored()
    {
        using var fs = SmallMount.Mount(OpsLvpApp.NewDataFolder(), 32);
        var profile = LiveTestProfile.Write(fs.Root);
        await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(profile), fs.Root);
        await LiveClient.ReaderKeyAsync(app); // issued (an audit entry) while the folder is writable
        var pusher = new BatchPusher(app, DateTimeOffset.UtcNow.AddSeconds(-60), BatchSize);
        for (var i = 0; i < 3; i++)
        {
            Assert.Equal(HttpStatusCode.Accepted, (await pusher.PushBatchAsync()).Status);
        }

        fs.SetReadOnly();
        const int WhileReadOnly = 10;
        for (var i = 0; i < WhileReadOnly; i++)
        {
            var (status, error) = await pusher.PushBatchAsync();
            Assert.True(status == HttpStatusCode.ServiceUnavailable, $"push {i} while read-only answered {(int)status}");
            Assert.StartsWith("not stored, retry later:", error, StringComparison.Ordinal);
            Assert.Contains("cannot be written", error, StringComparison.Ordinal);
            var health = await app.GetHealthAsync();
            Assert.Equal("failing", health.GetProperty("status").GetString());
            var engine = health.GetProperty("engine");
            Assert.Equal("failing", engine.GetProperty("audit").GetString());
            Assert.NotEqual(JsonValueKind.Null, engine.GetProperty("notRecordingSince").ValueKind);
            Assert.StartsWith("not recording:", health.GetProperty("statusReason").GetString(), StringComparison.Ordinal);
            await Task.Delay(100);
        }
        Assert.Equal(WhileReadOnly, pusher.Refused);

        fs.SetWritable();
        await pusher.PushUntilAcceptedAsync("the folder turning writable");
        Assert.Equal("ok", (await app.GetHealthAsync()).GetProperty("status").GetString());
        Assert.Equal(HttpStatusCode.Accepted, (await pusher.PushBatchAsync()).Status);

        var lost = await pusher.LostAsync();
        Assert.True(lost.Count == 0, $"{lost.Count} of {pusher.Acknowledged.Count} acknowledged readings were not stored");
        Assert.Equal((3 + 2) * BatchSize, pusher.Acknowledged.Count); // before, the first after and one more

        // the outage is ONE entry naming its start, end and reason, with every refused batch counted; nothing dated inside it
        var entries = await LiveClient.EntriesAsync(app);
        var gap = Assert.Single(entries, e => e.Kind == AuditEvents.RecordingGap);
        using var payload = JsonDocument.Parse(gap.PayloadJson);
        var from = payload.RootElement.GetProperty("from").GetDateTimeOffset();
        var to = payload.RootElement.GetProperty("to").GetDateTimeOffset();
        Assert.True(from < to, $"gap from {from:o} to {to:o}");
        Assert.DoesNotContain(entries, e => e.Time > from && e.Time < to);
        Assert.Contains("cannot be written", payload.RootElement.GetProperty("reason").GetString(), StringComparison.Ordinal);
        Assert.Equal(pusher.Refused, payload.RootElement.GetProperty("refusedBatches").GetInt32());
        Assert.Equal(pusher.Refused * BatchSize, payload.RootElement.GetProperty("refusedReadings").GetInt64());
        await LiveClient.AssertChainVerifiesAsync(app);
    }

    /// <summary>
    /// After the gap entry is written the WAL is folded back and truncated (<c>AuditStore.CheckpointAsync</c>,
    /// docs/reliability.md "Resuming"): a WAL grown to over 2 MB before the outage is near empty right after recording
    /// resumes. Without the checkpoint SQLite reuses the file from its start and never shrinks it (no
    /// <c>journal_size_limit</c> is set), so it stays at its size.
    /// </summary>
    [RootFact]
    public async Task AfterRecordingResumes_TheWalIsCheckpointedAndTruncated()
    {
        using var fs = SmallMount.Mount(OpsLvpApp.NewDataFolder(), 64);
        var profile = LiveTestProfile.Write(fs.Root);
        await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(profile), fs.Root);
        var wal = new FileInfo(Path.Combine(fs.Root, EngineServiceCollectionExtensions.DatabaseFileName + "-wal"));
        var pusher = new BatchPusher(app, DateTimeOffset.UtcNow.AddSeconds(-300), 200);
        const long Grown = 2L * 1024 * 1024;
        for (var i = 0; i < 5_000 && Length(wal) < Grown; i++)
        {
            Assert.Equal(HttpStatusCode.Accepted, (await pusher.PushBatchAsync()).Status);
        }
        var before = Length(wal);
        Assert.True(before >= Grown, $"the WAL grew only to {before} bytes");

        fs.SetReadOnly();
        Assert.Equal(HttpStatusCode.ServiceUnavailable, (await pusher.PushBatchAsync()).Status);
        Assert.True(Length(wal) >= Grown, $"the WAL shrank to {Length(wal)} bytes while the folder was read-only");
        fs.SetWritable();
        await pusher.PushUntilAcceptedAsync("the folder turning writable");

        // the first 202 after the gap follows the checkpoint; since then only a few commits' frames were added
        var after = Length(wal);
        Assert.True(after < 512 * 1024, $"the WAL is {after} bytes after recording resumed (was {before}): not checkpointed and truncated");
        var lost = await pusher.LostAsync();
        Assert.True(lost.Count == 0, $"{lost.Count} of {pusher.Acknowledged.Count} acknowledged readings were not stored");
    }

    private static long Length(FileInfo file)
    {
        file.Refresh();
        return file.Exists ? file.Length : 0;
    }
}
