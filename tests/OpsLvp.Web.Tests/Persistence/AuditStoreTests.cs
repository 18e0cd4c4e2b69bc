using System.Text.Json;
using Microsoft.Data.Sqlite;
using OpsLvp.Core.Audit;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

public class AuditStoreTests
{
    // Invented times and actors (demo night at the invented aerodrome XDMO).
    private static readonly DateTimeOffset _t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public async Task Append_ThenRead_ReturnsTheSameEntries_AndTheChainVerifies()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);

        var first = await store.AppendAsync([Entry(1), Entry(2)]);
        var second = await store.AppendAsync([Entry(3)]);

        Assert.Equal([1L, 2L], first.Select(e => e.Sequence));
        Assert.Equal(3, Assert.Single(second).Sequence);
        Assert.Equal(first[1].Hash, second[0].PreviousHash);
        Assert.Equal(second[0], await store.GetHeadAsync());
        Assert.Equal([.. first, .. second], await store.GetRangeAsync(1, 3));
        Assert.Equal([first[1]], await store.GetByTimeAsync(_t0.AddSeconds(2), _t0.AddSeconds(3)));
        var result = await store.VerifyAsync();
        Assert.True(result.Ok);
        Assert.Equal(3, result.Entries);
    }

    [Fact]
    public async Task Append_KeepsTheTimeToTheTick()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        var time = _t0.AddTicks(1234567);

        await store.AppendAsync([new NewAuditEntry("engine", "transition", "{}", time)]);

        Assert.Equal(time.UtcTicks, (await store.GetHeadAsync())!.Time.UtcTicks);
    }

    [Fact]
    public async Task Append_WithState_StoresTheStateWithTheLastSequence()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);

        await store.AppendAsync([Entry(1), Entry(2)], new EngineStateWrite("{\"phase\":\"preparation\"}", "xdmo-invented-1", _t0.AddSeconds(2)));
        await store.AppendAsync([], new EngineStateWrite("{\"phase\":\"active\"}", "xdmo-invented-1", _t0.AddSeconds(3)));

        var state = await store.GetLatestStateAsync();
        Assert.NotNull(state);
        Assert.Equal("{\"phase\":\"active\"}", state.StateJson);
        Assert.Equal(2, state.AuditSequence);
        Assert.Equal("xdmo-invented-1", state.ProfileVersion);
        Assert.Equal(_t0.AddSeconds(3), state.SavedAt);
    }

    [Fact]
    public async Task AfterRestart_ANewStoreSeesTheStateAndContinuesTheChain()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using (var before = new AuditStore(temp.Factory))
        {
            await before.AppendAsync([Entry(1), Entry(2)], new EngineStateWrite("{\"phase\":\"active\"}", "xdmo-invented-1", _t0));
        }
        SqliteConnection.ClearAllPools();

        using var after = new AuditStore(new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions(temp.ConnectionString)));
        var state = await after.GetLatestStateAsync();
        var appended = await after.AppendAsync([Entry(3)]);

        Assert.Equal(2, state!.AuditSequence);
        Assert.Equal(3, Assert.Single(appended).Sequence);
        Assert.True((await after.VerifyAsync()).Ok);
    }

    [Fact]
    public async Task ConcurrentAppends_FromSeveralTasksAndTwoStores_GiveNoGapAndNoDuplicate()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var storeA = new AuditStore(temp.Factory);
        using var storeB = new AuditStore(new OpsLvpDbContextFactory(temp.Options));
        const int tasks = 6;
        const int perTask = 15;

        await Task.WhenAll(Enumerable.Range(0, tasks).Select(t => Task.Run(async () =>
        {
            var store = t % 2 == 0 ? storeA : storeB;
            for (var i = 0; i < perTask; i++)
            {
                var payload = JsonSerializer.Serialize(new { task = t, i });
                var batch = i % 3 == 0
                    ? new[] { new NewAuditEntry($"task{t}", "tick", payload, _t0), new NewAuditEntry($"task{t}", "tick.extra", payload, _t0) }
                    : new[] { new NewAuditEntry($"task{t}", "tick", payload, _t0) };
                await store.AppendAsync(batch);
            }
        })));

        var all = await storeA.GetRangeAsync(1, long.MaxValue);
        var expectedCount = tasks * (perTask + ((perTask + 2) / 3));
        Assert.Equal(expectedCount, all.Count);
        Assert.Equal(Enumerable.Range(1, expectedCount).Select(i => (long)i), all.Select(e => e.Sequence));
        Assert.Equal(tasks * perTask, all.Where(e => e.Kind == "tick").Select(e => e.PayloadJson).Distinct().Count());
        Assert.True((await storeA.VerifyAsync()).Ok);
    }

    [Fact]
    public async Task PayloadByteChangedWithRawSql_IsCaughtNamingTheSequence()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        await store.AppendAsync([Entry(1), Entry(2), Entry(3), Entry(4)]);

        await temp.ExecuteRawAsync("DROP TRIGGER audit_entries_no_update;");
        var changed = await temp.ExecuteRawAsync("UPDATE audit_entries SET payload_json = replace(payload_json, '\"n\":3', '\"n\":8') WHERE sequence = 3;");

        var result = await store.VerifyAsync();
        Assert.Equal(1, changed);
        Assert.False(result.Ok);
        Assert.Equal(3, result.FirstBadSequence);
        Assert.Equal(AuditFailure.HashMismatch, result.Failure);
        Assert.Equal(4, result.Entries);
    }

    [Fact]
    public async Task RowDeletedWithRawSql_IsCaughtAsAGap()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        await store.AppendAsync([Entry(1), Entry(2), Entry(3)]);

        await temp.ExecuteRawAsync("DROP TRIGGER audit_entries_no_delete; DELETE FROM audit_entries WHERE sequence = 2;");

        var result = await store.VerifyAsync();
        Assert.Equal(2, result.FirstBadSequence);
        Assert.Equal(AuditFailure.SequenceGap, result.Failure);
    }

    [Fact]
    public async Task TimeTextMangledWithRawSql_IsAMalformedEntry_NotACrash()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        await store.AppendAsync([Entry(1), Entry(2)]);

        await temp.ExecuteRawAsync("DROP TRIGGER audit_entries_no_update; UPDATE audit_entries SET time = 'yesterday' WHERE sequence = 2;");

        var result = await store.VerifyAsync();
        Assert.Equal(2, result.FirstBadSequence);
        Assert.Equal(AuditFailure.MalformedEntry, result.Failure);
    }

    [Fact]
    public async Task AuditInsertAbortedByTheDatabase_Throws_AndNeitherEntriesNorStateAreWritten()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        await store.AppendAsync([Entry(1)], new EngineStateWrite("{\"phase\":\"normal\"}", "xdmo-invented-1", _t0));
        await temp.ExecuteRawAsync("CREATE TRIGGER refuse_boom BEFORE INSERT ON audit_entries WHEN NEW.kind = 'boom' BEGIN SELECT RAISE(ABORT, 'refused for the test'); END;");

        var error = await Assert.ThrowsAsync<AuditCommitException>(() => store.AppendAsync(
            [Entry(2), new NewAuditEntry("engine", "boom", "{}", _t0)],
            new EngineStateWrite("{\"phase\":\"active\"}", "xdmo-invented-1", _t0.AddSeconds(1))));

        Assert.Contains("refused for the test", error.Message, StringComparison.Ordinal);
        Assert.Equal(1, (await store.GetHeadAsync())!.Sequence);
        Assert.Equal("{\"phase\":\"normal\"}", (await store.GetLatestStateAsync())!.StateJson);
        Assert.Equal(2, Assert.Single(await store.AppendAsync([Entry(2)])).Sequence);
    }

    [Fact]
    public async Task StateWriteAbortedByTheDatabase_RollsBackTheEntriesToo()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        await store.AppendAsync([Entry(1)]);
        await temp.ExecuteRawAsync("CREATE TRIGGER refuse_state BEFORE INSERT ON engine_state BEGIN SELECT RAISE(ABORT, 'state refused for the test'); END;");

        await Assert.ThrowsAsync<AuditCommitException>(() => store.AppendAsync([Entry(2), Entry(3)], new EngineStateWrite("{}", "xdmo-invented-1", _t0)));

        Assert.Equal(1, (await store.GetHeadAsync())!.Sequence);
        Assert.Null(await store.GetLatestStateAsync());
    }

    [Fact]
    public async Task ReadOnlyDatabase_AppendThrows()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var readOnly = new SqliteConnectionStringBuilder { DataSource = temp.FilePath, Mode = SqliteOpenMode.ReadOnly }.ToString();
        using var store = new AuditStore(new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions(readOnly)));

        await Assert.ThrowsAsync<AuditCommitException>(() => store.AppendAsync([Entry(1)]));

        Assert.Null(await store.GetHeadAsync());
    }

    [Theory]
    [InlineData("", "tick", "{}")]
    [InlineData("engine", "", "{}")]
    [InlineData("engine", "tick", "{not json")]
    public async Task BadEntry_IsRefusedBeforeAnythingIsWritten(string actor, string kind, string payload)
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);

        await Assert.ThrowsAnyAsync<ArgumentException>(() => store.AppendAsync([Entry(1), new NewAuditEntry(actor, kind, payload, _t0)]));

        Assert.Null(await store.GetHeadAsync());
    }

    private static NewAuditEntry Entry(int n) =>
        new("dm.invented", "transition", $"{{\"n\":{n},\"note\":\"invented\"}}", _t0.AddSeconds(n));
}
