using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Configuration;

namespace OpsLvp.Data;

/// <summary>
/// Provider choice and connection setup, from configuration <c>OpsLvp:Database:Provider</c> (only
/// <c>Sqlite</c> so far; the default) and <c>OpsLvp:Database:ConnectionString</c>.
/// </summary>
public static class OpsLvpDatabase
{
    public const string ProviderSetting = "OpsLvp:Database:Provider";

    public const string ConnectionStringSetting = "OpsLvp:Database:ConnectionString";

    public const string SqliteProvider = "Sqlite";

    /// <summary>Configures <paramref name="builder"/> from the two settings.</summary>
    /// <exception cref="InvalidOperationException">An unsupported provider or a missing connection string; the message names the setting.</exception>
    public static DbContextOptionsBuilder Configure(DbContextOptionsBuilder builder, IConfiguration configuration, string? defaultConnectionString = null)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var connectionString = configuration[ConnectionStringSetting];
        return Configure(builder, configuration[ProviderSetting], string.IsNullOrWhiteSpace(connectionString) ? defaultConnectionString : connectionString);
    }

    /// <summary>Configures <paramref name="builder"/> for a provider name (null or empty: Sqlite) and connection string.</summary>
    /// <exception cref="InvalidOperationException">An unsupported provider or a missing connection string; the message names the setting.</exception>
    public static DbContextOptionsBuilder Configure(DbContextOptionsBuilder builder, string? provider, string? connectionString)
    {
        ArgumentNullException.ThrowIfNull(builder);
        if (!string.IsNullOrWhiteSpace(provider) && !string.Equals(provider, SqliteProvider, StringComparison.OrdinalIgnoreCase))
        {
            throw new InvalidOperationException($"{ProviderSetting} is '{provider}', which is not supported; use '{SqliteProvider}'.");
        }
        if (string.IsNullOrWhiteSpace(connectionString))
        {
            throw new InvalidOperationException($"{ConnectionStringSetting} is not set (e.g. 'Data Source=opslvp.db').");
        }
        SqliteConnectionStringBuilder parsed;
        try
        {
            parsed = new SqliteConnectionStringBuilder(connectionString);
        }
        catch (ArgumentException ex)
        {
            throw new InvalidOperationException($"{ConnectionStringSetting} is not a valid SQLite connection string: {ex.Message}", ex);
        }
        var readOnly = parsed.Mode == SqliteOpenMode.ReadOnly;
        return builder
            .UseSqlite(parsed.ConnectionString)
            .AddInterceptors(new SqlitePragmaInterceptor(readOnly));
    }

    /// <summary>Options for a SQLite file, for tools and tests.</summary>
    public static DbContextOptions<OpsLvpDbContext> SqliteOptions(string connectionString)
    {
        var builder = new DbContextOptionsBuilder<OpsLvpDbContext>();
        Configure(builder, SqliteProvider, connectionString);
        return builder.Options;
    }
}
