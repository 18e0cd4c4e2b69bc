using OpsLvp.Core.Readings;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

public class ReadingStoreTests
{
    // Invented readings from invented sensors.
    private static readonly DateTimeOffset _t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public async Task Batch_OfAcceptedAndRejected_IsStoredAndReadBackInOrder()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new ReadingStore(temp.Factory);
        var batch = new[]
        {
            ReceivedReading.Accept(new Reading(_t0, "RVR-09-TDZ", ReadingKind.Rvr, 550), _t0.AddSeconds(1), "sim"),
            ReceivedReading.Reject(new Reading(_t0, "RVR-09-MID", ReadingKind.Rvr, 600, ReadingStatus.Failed), _t0.AddSeconds(1), "sim", RejectReason.StatusNotOk, "status FAILED"),
            new ReceivedReading(_t0.AddSeconds(1), "push:demo", "??", "Fog", null, null, null, false, RejectReason.Malformed, "kind 'Fog' unknown"),
        };

        await store.InsertAsync(batch);

        var read = await store.GetReceivedAsync(_t0, _t0.AddMinutes(1));
        Assert.Equal(batch, read);
    }

    [Fact]
    public async Task ReceivedTimeRange_IsHalfOpen()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new ReadingStore(temp.Factory);
        await store.InsertAsync([
            ReceivedReading.Accept(new Reading(_t0, "VIS-1", ReadingKind.Visibility, 800), _t0, "sim"),
            ReceivedReading.Accept(new Reading(_t0, "VIS-1", ReadingKind.Visibility, 700), _t0.AddSeconds(10), "sim"),
        ]);

        var read = await store.GetReceivedAsync(_t0, _t0.AddSeconds(10));

        Assert.Equal(800, Assert.Single(read).Value);
    }

    [Fact]
    public async Task AcceptedWithAReason_OrRejectedWithout_IsRefused_AndTheBatchIsNotWritten()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new ReadingStore(temp.Factory);
        var good = ReceivedReading.Accept(new Reading(_t0, "VIS-1", ReadingKind.Visibility, 800), _t0, "sim");

        await Assert.ThrowsAsync<ArgumentException>(() => store.InsertAsync([good, good with { RejectReason = RejectReason.Duplicate }]));
        await Assert.ThrowsAsync<ArgumentException>(() => store.InsertAsync([good, good with { Accepted = false }]));

        Assert.Empty(await store.GetReceivedAsync(_t0, _t0.AddDays(1)));
    }
}
