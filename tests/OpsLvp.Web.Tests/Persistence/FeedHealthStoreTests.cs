using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

public class FeedHealthStoreTests
{
    private static readonly DateTimeOffset _t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public async Task Failures_Count_UntilAGoodPollResetsThem()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var store = new FeedHealthStore(temp.Factory);

        await store.RecordFailureAsync("metar", _t0, "timeout");
        await store.RecordFailureAsync("metar", _t0.AddSeconds(30), "HTTP 503");
        var failing = Assert.Single(await store.GetAllAsync());
        await store.RecordSuccessAsync("metar", _t0.AddSeconds(60));
        var recovered = Assert.Single(await store.GetAllAsync());

        Assert.Equal(new FeedHealth("metar", null, 2, "HTTP 503", _t0.AddSeconds(30)), failing);
        Assert.Equal(new FeedHealth("metar", _t0.AddSeconds(60), 0, "HTTP 503", _t0.AddSeconds(30)), recovered);
    }
}
