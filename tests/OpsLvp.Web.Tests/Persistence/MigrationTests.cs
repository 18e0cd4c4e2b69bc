using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data;

namespace OpsLvp.Web.Tests.Persistence;

public class MigrationTests
{
    [Fact]
    public async Task Migrate_OnAnEmptyFile_CreatesEveryTableAndLeavesNothingPending()
    {
        using var temp = TempDatabase.CreateEmpty();
        Assert.False(File.Exists(temp.FilePath));

        await DatabaseStartup.MigrateAndCheckAsync(temp.Factory);

        await using var db = temp.Factory.CreateDbContext();
        var tables = await db.Database
            .SqlQuery<string>($"SELECT name AS \"Value\" FROM sqlite_master WHERE type = 'table' ORDER BY name")
            .ToListAsync();
        Assert.Contains("readings", tables);
        Assert.Contains("audit_entries", tables);
        Assert.Contains("engine_state", tables);
        Assert.Contains("feed_health", tables);
        Assert.Contains("data_protection_keys", tables);
        Assert.Contains("InitialCreate", string.Join(" ", await db.Database.GetAppliedMigrationsAsync()), StringComparison.Ordinal);
        Assert.Empty(await db.Database.GetPendingMigrationsAsync());
    }

    [Fact]
    public async Task Migrate_Twice_IsHarmless()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();

        await DatabaseStartup.MigrateAndCheckAsync(temp.Factory);

        await using var db = temp.Factory.CreateDbContext();
        Assert.Equal(db.Database.GetMigrations(), await db.Database.GetAppliedMigrationsAsync());
    }

    [Fact]
    public void Model_HasNoChangesMissingFromTheMigrations()
    {
        using var temp = TempDatabase.CreateEmpty();
        using var db = temp.Factory.CreateDbContext();

        Assert.False(db.Database.HasPendingModelChanges());
    }

    [Fact]
    public async Task AuditRows_CannotBeUpdatedOrDeleted_ThroughSql()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new OpsLvp.Data.Stores.AuditStore(temp.Factory);
        await store.AppendAsync([new("engine", "transition", "{}", new DateTimeOffset(2026, 1, 2, 3, 0, 0, TimeSpan.Zero))]);

        var update = await Assert.ThrowsAsync<SqliteException>(() => temp.ExecuteRawAsync("UPDATE audit_entries SET actor = 'x'"));
        var delete = await Assert.ThrowsAsync<SqliteException>(() => temp.ExecuteRawAsync("DELETE FROM audit_entries"));

        Assert.Contains("append-only", update.Message, StringComparison.Ordinal);
        Assert.Contains("append-only", delete.Message, StringComparison.Ordinal);
    }
}
