using System.Text.Json;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Readings;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// The store contract on both providers: each check is written once and run on a SQLite file and on a database of a
/// throwaway PostgreSQL cluster (skipped, saying why, without the server programs unless OPSLVP_REQUIRE_SERVICES=1).
/// Times, actors and readings are invented.
/// </summary>
public sealed class ProviderStoreTests
{
    private const string Sqlite = OpsLvpDatabase.SqliteProvider;
    private const string Postgres = OpsLvpDatabase.PostgresProvider;

    private static readonly DateTimeOffset s_t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public Task Migrations_MatchTheModel_Sqlite() => Migrations_MatchTheModel(Sqlite);

    [PostgresFact]
    public Task Migrations_MatchTheModel_Postgres() => Migrations_MatchTheModel(Postgres);

    [Fact]
    public Task AppendReadVerify_Sqlite() => AppendReadVerify(Sqlite);

    [PostgresFact]
    public Task AppendReadVerify_Postgres() => AppendReadVerify(Postgres);

    [Fact]
    public Task ConcurrentAppends_FromTwoStores_NeverFork_Sqlite() => ConcurrentAppends_FromTwoStores_NeverFork(Sqlite);

    [PostgresFact]
    public Task ConcurrentAppends_FromTwoStores_NeverFork_Postgres() => ConcurrentAppends_FromTwoStores_NeverFork(Postgres);

    [Fact]
    public Task AfterRestart_ANewStoreSeesTheStateAndContinuesTheChain_Sqlite() => AfterRestart_ANewStoreSeesTheStateAndContinuesTheChain(Sqlite);

    [PostgresFact]
    public Task AfterRestart_ANewStoreSeesTheStateAndContinuesTheChain_Postgres() => AfterRestart_ANewStoreSeesTheStateAndContinuesTheChain(Postgres);

    [Fact]
    public Task RawUpdateAndDelete_AreRefusedByTheDatabase_Sqlite() => RawUpdateAndDelete_AreRefusedByTheDatabase(Sqlite);

    [PostgresFact]
    public Task RawUpdateAndDelete_AreRefusedByTheDatabase_Postgres() => RawUpdateAndDelete_AreRefusedByTheDatabase(Postgres);

    [Fact]
    public Task PayloadChangedWithTheGuardsOff_IsCaughtNamingTheSequence_Sqlite() => PayloadChangedWithTheGuardsOff_IsCaughtNamingTheSequence(Sqlite);

    [PostgresFact]
    public Task PayloadChangedWithTheGuardsOff_IsCaughtNamingTheSequence_Postgres() => PayloadChangedWithTheGuardsOff_IsCaughtNamingTheSequence(Postgres);

    [Fact]
    public Task AppendAbortedByTheDatabase_WritesNeitherEntriesNorState_Sqlite() => AppendAbortedByTheDatabase_WritesNeitherEntriesNorState(Sqlite);

    [PostgresFact]
    public Task AppendAbortedByTheDatabase_WritesNeitherEntriesNorState_Postgres() => AppendAbortedByTheDatabase_WritesNeitherEntriesNorState(Postgres);

    [Fact]
    public Task Readings_InsertedAndReadBackByReceiptTime_Sqlite() => Readings_InsertedAndReadBackByReceiptTime(Sqlite);

    [PostgresFact]
    public Task Readings_InsertedAndReadBackByReceiptTime_Postgres() => Readings_InsertedAndReadBackByReceiptTime(Postgres);

    [PostgresFact]
    public async Task Postgres_SynchronousCommitOff_StopsTheStart_NamingTheSetting()
    {
        using var db = ProviderDatabase.Create(Postgres);
        var name = new Npgsql.NpgsqlConnectionStringBuilder(db.ConnectionString).Database;
        await db.ExecuteRawAsync($"ALTER DATABASE \"{name}\" SET synchronous_commit = off");

        var error = await Assert.ThrowsAsync<InvalidOperationException>(() => DatabaseStartup.MigrateAndCheckAsync(db.Factory));

        Assert.Contains("synchronous_commit", error.Message, StringComparison.Ordinal);
    }

    [PostgresFact]
    public async Task Postgres_WriterConnectionsDropped_TheNextAppendsStartOnFreshConnections_AndTheChainHasNoGap()
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(Postgres);
        using var store = new AuditStore(db.Factory);
        using var readings = new ReadingStore(db.Factory);
        await store.AppendAsync([Entry(1)], new EngineStateWrite("{}", "xdmo-invented-1", s_t0));
        await readings.InsertAsync([new ReceivedReading(s_t0, "push:invented", "TDZ-INV", "rvr", s_t0, 600, "ok", true)]);

        // as a server restart or a network cut does to the kept connections
        Assert.True(PostgresCluster.Shared.TerminateConnections(db.ConnectionString) >= 2);
        // idle pooled connections (EF reads) are dropped here; the writers' kept connections are what this test is about
        Npgsql.NpgsqlConnection.ClearAllPools();

        // the first use may still meet the dead connection (refused, nothing written); a later one must succeed
        var appended = await FirstSuccessAsync(() => store.AppendAsync([Entry(2)], new EngineStateWrite("{}", "xdmo-invented-1", s_t0)));
        await FirstSuccessAsync(async () =>
        {
            await readings.InsertAsync([new ReceivedReading(s_t0.AddSeconds(1), "push:invented", "TDZ-INV", "rvr", s_t0.AddSeconds(1), 650, "ok", true)]);
            return 0;
        });

        Assert.Equal(2, Assert.Single(appended).Sequence);
        Assert.True((await store.VerifyAsync()).Ok);
        Assert.Equal(2, (await readings.GetReceivedAsync(s_t0, s_t0.AddMinutes(1))).Count);
    }

    [Fact]
    public void Postgres_WithoutAConnectionString_IsRefusedNamingTheSetting()
    {
        var builder = new DbContextOptionsBuilder<OpsLvpDbContext>();
        var error = Assert.Throws<InvalidOperationException>(() => OpsLvpDatabase.Configure(builder, Postgres, null));
        Assert.Contains(OpsLvpDatabase.PostgresConnectionStringSetting, error.Message, StringComparison.Ordinal);
        var bad = Assert.Throws<InvalidOperationException>(() => OpsLvpDatabase.Configure(builder, "Oracle", "x"));
        Assert.Contains("'Postgres'", bad.Message, StringComparison.Ordinal);
    }

    private static async Task Migrations_MatchTheModel(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        await using var context = db.Factory.CreateDbContext();

        Assert.Empty(await context.Database.GetPendingMigrationsAsync());
        Assert.False(context.Database.HasPendingModelChanges(), $"the {provider} migrations do not match the model: add a migration");
        Assert.Equal(db.IsPostgres, context.Database.IsNpgsql());
    }

    private static async Task AppendReadVerify(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using var store = new AuditStore(db.Factory);
        var time = s_t0.AddTicks(1234567);

        var first = await store.AppendAsync([Entry(1), Entry(2)], new EngineStateWrite("{\"phase\":\"preparation\"}", "xdmo-invented-1", s_t0));
        var second = await store.AppendAsync([new NewAuditEntry("engine", "transition", "{\"n\":3}", time)], new EngineStateWrite("{\"phase\":\"active\"}", "xdmo-invented-1", time));

        Assert.Equal([1L, 2L], first.Select(e => e.Sequence));
        Assert.Equal(first[1].Hash, Assert.Single(second).PreviousHash);
        Assert.Equal(second[0], await store.GetHeadAsync());
        Assert.Equal(time.UtcTicks, (await store.GetHeadAsync())!.Time.UtcTicks);
        Assert.Equal([.. first, .. second], await store.GetRangeAsync(1, 3));
        Assert.Equal([first[1]], await store.GetByTimeAsync(s_t0.AddSeconds(2), s_t0.AddSeconds(3)));
        var state = await store.GetLatestStateAsync();
        Assert.Equal("{\"phase\":\"active\"}", state!.StateJson);
        Assert.Equal(3, state.AuditSequence);
        Assert.Equal(second[0].Hash, state.AuditHash);
        Assert.Equal(time, state.SavedAt);
        var result = await store.VerifyAsync();
        Assert.True(result.Ok, result.Detail);
        Assert.Equal(3, result.Entries);
    }

    private static async Task ConcurrentAppends_FromTwoStores_NeverFork(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using var storeA = new AuditStore(db.Factory);
        using var storeB = new AuditStore(db.NewFactory());
        const int tasks = 6;
        const int perTask = 15;

        await Task.WhenAll(Enumerable.Range(0, tasks).Select(t => Task.Run(async () =>
        {
            var store = t % 2 == 0 ? storeA : storeB;
            for (var i = 0; i < perTask; i++)
            {
                var payload = JsonSerializer.Serialize(new { task = t, i });
                var batch = i % 3 == 0
                    ? new[] { new NewAuditEntry($"task{t}", "tick", payload, s_t0), new NewAuditEntry($"task{t}", "tick.extra", payload, s_t0) }
                    : new[] { new NewAuditEntry($"task{t}", "tick", payload, s_t0) };
                await store.AppendAsync(batch, new EngineStateWrite(payload, "xdmo-invented-1", s_t0));
            }
        })));

        var all = await storeA.GetRangeAsync(1, long.MaxValue);
        var expectedCount = tasks * (perTask + ((perTask + 2) / 3));
        Assert.Equal(Enumerable.Range(1, expectedCount).Select(i => (long)i), all.Select(e => e.Sequence));
        Assert.Equal(tasks * perTask, all.Where(e => e.Kind == "tick").Select(e => e.PayloadJson).Distinct().Count());
        Assert.True((await storeA.VerifyAsync()).Ok);
        // the state row names the head written in the same transaction as it
        var state = await storeB.GetLatestStateAsync();
        Assert.Equal(expectedCount, state!.AuditSequence);
        Assert.Equal(all[^1].Hash, state.AuditHash);
    }

    private static async Task AfterRestart_ANewStoreSeesTheStateAndContinuesTheChain(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using (var before = new AuditStore(db.Factory))
        {
            await before.AppendAsync([Entry(1), Entry(2)], new EngineStateWrite("{\"phase\":\"active\"}", "xdmo-invented-1", s_t0));
        }

        using var after = new AuditStore(db.NewFactory());
        var state = await after.GetLatestStateAsync();
        var appended = await after.AppendAsync([Entry(3)]);

        Assert.Equal(2, state!.AuditSequence);
        Assert.Equal(3, Assert.Single(appended).Sequence);
        Assert.True((await after.VerifyAsync()).Ok);
    }

    private static async Task RawUpdateAndDelete_AreRefusedByTheDatabase(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using var store = new AuditStore(db.Factory);
        await store.AppendAsync([Entry(1), Entry(2)]);

        var update = await Assert.ThrowsAnyAsync<System.Data.Common.DbException>(() => db.ExecuteRawAsync("UPDATE audit_entries SET actor = 'someone' WHERE sequence = 1"));
        var delete = await Assert.ThrowsAnyAsync<System.Data.Common.DbException>(() => db.ExecuteRawAsync("DELETE FROM audit_entries WHERE sequence = 2"));

        Assert.Contains("append-only", update.Message, StringComparison.Ordinal);
        Assert.Contains("append-only", delete.Message, StringComparison.Ordinal);
        if (db.IsPostgres)
        {
            var truncate = await Assert.ThrowsAnyAsync<System.Data.Common.DbException>(() => db.ExecuteRawAsync("TRUNCATE audit_entries"));
            Assert.Contains("append-only", truncate.Message, StringComparison.Ordinal);
        }
        Assert.Equal(2, (await store.GetRangeAsync(1, 9)).Count);
        Assert.True((await store.VerifyAsync()).Ok);
    }

    private static async Task PayloadChangedWithTheGuardsOff_IsCaughtNamingTheSequence(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using var store = new AuditStore(db.Factory);
        await store.AppendAsync([Entry(1), Entry(2), Entry(3), Entry(4)]);

        await db.ExecuteRawAsync(db.IsPostgres ? "DROP TRIGGER audit_entries_no_update ON audit_entries" : "DROP TRIGGER audit_entries_no_update;");
        var changed = await db.ExecuteRawAsync("UPDATE audit_entries SET payload_json = replace(payload_json, '\"n\":3', '\"n\":8') WHERE sequence = 3");

        var result = await store.VerifyAsync();
        Assert.Equal(1, changed);
        Assert.False(result.Ok);
        Assert.Equal(3, result.FirstBadSequence);
        Assert.Equal(AuditFailure.HashMismatch, result.Failure);
    }

    private static async Task AppendAbortedByTheDatabase_WritesNeitherEntriesNorState(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using var store = new AuditStore(db.Factory);
        await store.AppendAsync([Entry(1)], new EngineStateWrite("{\"phase\":\"normal\"}", "xdmo-invented-1", s_t0));
        if (db.IsPostgres)
        {
            await db.ExecuteRawAsync("CREATE FUNCTION refuse_boom() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RAISE EXCEPTION 'refused for the test'; END; $$;"
                + "CREATE TRIGGER refuse_boom BEFORE INSERT ON audit_entries FOR EACH ROW WHEN (NEW.kind = 'boom') EXECUTE FUNCTION refuse_boom();");
        }
        else
        {
            await db.ExecuteRawAsync("CREATE TRIGGER refuse_boom BEFORE INSERT ON audit_entries WHEN NEW.kind = 'boom' BEGIN SELECT RAISE(ABORT, 'refused for the test'); END;");
        }

        var error = await Assert.ThrowsAsync<AuditCommitException>(() => store.AppendAsync(
            [Entry(2), new NewAuditEntry("engine", "boom", "{}", s_t0)],
            new EngineStateWrite("{\"phase\":\"active\"}", "xdmo-invented-1", s_t0.AddSeconds(1))));

        Assert.Contains("refused for the test", error.Message, StringComparison.Ordinal);
        Assert.Equal(1, (await store.GetHeadAsync())!.Sequence);
        Assert.Equal("{\"phase\":\"normal\"}", (await store.GetLatestStateAsync())!.StateJson);
        // the writer starts over on a fresh connection and the chain continues without a gap
        Assert.Equal(2, Assert.Single(await store.AppendAsync([Entry(2)])).Sequence);
        Assert.True((await store.VerifyAsync()).Ok);
    }

    private static async Task Readings_InsertedAndReadBackByReceiptTime(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        using var store = new ReadingStore(db.Factory);
        var accepted = new ReceivedReading(s_t0.AddSeconds(1), "push:invented", "TDZ-INV", "rvr", s_t0, 550.5, "ok", true, null, null);
        var rejected = new ReceivedReading(s_t0.AddSeconds(2), "push:invented", "MID-INV", "rvr", s_t0, null, null, false, RejectReason.OutOfRange, "value 99999 out of range");
        var later = new ReceivedReading(s_t0.AddSeconds(9), "push:invented", "END-INV", "rvr", s_t0.AddSeconds(8), 1200, "ok", true, null, null);

        await store.InsertAsync([accepted, rejected]);
        await store.InsertAsync([later]);

        Assert.Equal([accepted, rejected], await store.GetReceivedAsync(s_t0, s_t0.AddSeconds(9)));
        Assert.Equal([accepted, rejected, later], await store.GetReceivedAsync(s_t0, s_t0.AddSeconds(10)));
        await Assert.ThrowsAnyAsync<ArgumentException>(() => store.InsertAsync([accepted with { Value = null }]));
        Assert.Equal(3, (await store.GetReceivedAsync(s_t0, s_t0.AddHours(1))).Count);
    }

    private static async Task<T> FirstSuccessAsync<T>(Func<Task<T>> action)
    {
        try
        {
            return await action();
        }
        catch (Exception ex) when (ex is AuditCommitException or System.Data.Common.DbException or InvalidOperationException)
        {
            return await action();
        }
    }

    private static NewAuditEntry Entry(int n) =>
        new("dm.invented", "transition", $"{{\"n\":{n},\"note\":\"invented\"}}", s_t0.AddSeconds(n));
}
