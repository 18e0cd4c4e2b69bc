using Microsoft.Extensions.Time.Testing;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// Remembered lookups of API keys (and display tokens, same base): a revocation through the store counts at once,
/// a change made in the file by anything else within <see cref="SecretRecordStore{TRow}.RememberFor"/>, and use is
/// still recorded to the minute.
/// </summary>
public sealed class SecretLookupTests
{
    private static readonly DateTimeOffset _t0 = new(2026, 1, 15, 2, 0, 0, TimeSpan.Zero);

    [Fact]
    public async Task RevokedThroughTheStore_IsNotFound_EvenRightAfterALookup()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var store = new ApiKeyStore(temp.Factory);
        var issued = await store.IssueAsync("north sensors (invented)", [ApiKeyStore.IngestScope], "test-admin", _t0);
        Assert.NotNull(await store.FindActiveAsync(issued.Secret, _t0));

        Assert.True(await store.RevokeAsync(issued.Credential.Id, _t0.AddSeconds(1)));

        Assert.Null(await store.FindActiveAsync(issued.Secret, _t0.AddSeconds(2)));
    }

    [Fact]
    public async Task RevokedInTheFileByAnythingElse_IsSeenOnceTheRememberedLookupExpires()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        // The remembered window runs on a fake real-time clock: a slow machine cannot make the UPDATE below outlast it.
        var realClock = new FakeTimeProvider();
        var store = new ApiKeyStore(temp.Factory) { RememberFor = TimeSpan.FromMilliseconds(200), RealClock = realClock };
        var issued = await store.IssueAsync("north sensors (invented)", [ApiKeyStore.IngestScope], "test-admin", _t0);
        Assert.NotNull(await store.FindActiveAsync(issued.Secret, _t0));

        await temp.ExecuteRawAsync("UPDATE api_keys SET revoked_at = '2026-01-15T02:00:01.0000000Z';");

        // Within the window the remembered record answers (this is the documented staleness) ...
        Assert.NotNull(await store.FindActiveAsync(issued.Secret, _t0.AddSeconds(2)));
        realClock.Advance(TimeSpan.FromMilliseconds(400));
        // ... after it the file does.
        Assert.Null(await store.FindActiveAsync(issued.Secret, _t0.AddSeconds(3)));
    }

    [Fact]
    public async Task WithNothingRemembered_EveryLookupAsksTheFile()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var store = new ApiKeyStore(temp.Factory) { RememberFor = TimeSpan.Zero };
        var issued = await store.IssueAsync("north sensors (invented)", [ApiKeyStore.IngestScope], "test-admin", _t0);
        Assert.NotNull(await store.FindActiveAsync(issued.Secret, _t0));

        await temp.ExecuteRawAsync("UPDATE api_keys SET revoked_at = '2026-01-15T02:00:01.0000000Z';");

        Assert.Null(await store.FindActiveAsync(issued.Secret, _t0.AddSeconds(2)));
    }

    [Fact]
    public async Task RememberedLookups_StillRecordUse_ToTheMinute()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var store = new ApiKeyStore(temp.Factory);
        var issued = await store.IssueAsync("north sensors (invented)", [ApiKeyStore.IngestScope], "test-admin", _t0);

        await store.FindActiveAsync(issued.Secret, _t0);
        await store.FindActiveAsync(issued.Secret, _t0.AddSeconds(30));
        Assert.Equal(_t0, (await store.ListAsync()).Single().LastUsedAt);

        await store.FindActiveAsync(issued.Secret, _t0.AddSeconds(61));
        Assert.Equal(_t0.AddSeconds(61), (await store.ListAsync()).Single().LastUsedAt);
    }

    [Fact]
    public async Task UnknownSecret_IsNotFound()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var store = new ApiKeyStore(temp.Factory);
        await store.IssueAsync("north sensors (invented)", [ApiKeyStore.IngestScope], "test-admin", _t0);

        Assert.Null(await store.FindActiveAsync(ApiKeyStore.Prefix + "not-issued", _t0));
        Assert.Null(await store.FindActiveAsync("no-prefix", _t0));
    }
}
