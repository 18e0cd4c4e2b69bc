using Microsoft.EntityFrameworkCore;

namespace OpsLvp.Data;

/// <summary>Makes a fresh context per unit of work (stores are singletons and must not share a context).</summary>
public sealed class OpsLvpDbContextFactory(DbContextOptions<OpsLvpDbContext> options) : IDbContextFactory<OpsLvpDbContext>
{
    public OpsLvpDbContext CreateDbContext() => new(options);
}
