using Microsoft.EntityFrameworkCore;

namespace OpsLvp.Data;

/// <summary>What the host runs before serving: apply migrations, then check the durability pragmas.</summary>
public static class DatabaseStartup
{
    /// <exception cref="InvalidOperationException">A pragma is not in force (see <see cref="DatabaseChecks"/>).</exception>
    public static async Task MigrateAndCheckAsync(IDbContextFactory<OpsLvpDbContext> factory, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(factory);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        await db.Database.MigrateAsync(cancellationToken);
        await DatabaseChecks.EnsureDurableAsync(db, cancellationToken);
    }
}
