using Microsoft.EntityFrameworkCore;

namespace OpsLvp.Data;

/// <summary>
/// Which provider a context factory is configured for, asked once (a context is made, no connection opened). The stores
/// use it to pick their hot write path (<see cref="SqliteWriter"/> or <see cref="PostgresWriter"/>), so code above the
/// stores never asks.
/// </summary>
internal sealed class ProviderProbe(IDbContextFactory<OpsLvpDbContext> factory)
{
    private readonly Lazy<bool> _isPostgres = new(() =>
    {
        using var db = factory.CreateDbContext();
        return db.Database.IsNpgsql();
    });

    /// <summary>True when the factory's contexts use Npgsql.</summary>
    /// <exception cref="InvalidOperationException">The settings are invalid (the message names the setting).</exception>
    public bool IsPostgres => _isPostgres.Value;
}
