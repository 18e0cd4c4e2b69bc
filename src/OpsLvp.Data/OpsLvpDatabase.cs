using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Configuration;
using Npgsql;

namespace OpsLvp.Data;

/// <summary>
/// Provider choice and connection setup, from configuration <c>OpsLvp:Database:Provider</c> (<c>Sqlite</c>, the
/// default, or <c>Postgres</c>) and the connection string: <c>OpsLvp:Database:ConnectionString</c> for SQLite,
/// <c>ConnectionStrings:OpsLvp</c> (or <c>OpsLvp:Database:ConnectionString</c>) for PostgreSQL. PostgreSQL's
/// migrations live in the assembly <see cref="PostgresMigrationsAssembly"/>; SQLite's stay in this one.
/// </summary>
public static class OpsLvpDatabase
{
    public const string ProviderSetting = "OpsLvp:Database:Provider";

    public const string ConnectionStringSetting = "OpsLvp:Database:ConnectionString";

    public const string SqliteProvider = "Sqlite";

    public const string PostgresProvider = "Postgres";

    /// <summary>Where the PostgreSQL connection string is read first (<c>ConnectionStrings:OpsLvp</c>).</summary>
    public const string PostgresConnectionStringSetting = "ConnectionStrings:OpsLvp";

    /// <summary>The assembly holding the PostgreSQL migrations (the usual EF pattern: one migrations assembly per provider).</summary>
    public const string PostgresMigrationsAssembly = "OpsLvp.Data.Postgres";

    /// <summary>Configures <paramref name="builder"/> from the two settings.</summary>
    /// <exception cref="InvalidOperationException">An unsupported provider or a missing connection string; the message names the setting.</exception>
    public static DbContextOptionsBuilder Configure(DbContextOptionsBuilder builder, IConfiguration configuration, string? defaultConnectionString = null)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var provider = configuration[ProviderSetting];
        if (IsPostgres(provider))
        {
            // The SQLite default (a file in the data folder) never applies to PostgreSQL: a missing setting is an error.
            var postgres = configuration[PostgresConnectionStringSetting];
            return Configure(builder, provider, string.IsNullOrWhiteSpace(postgres) ? configuration[ConnectionStringSetting] : postgres);
        }
        var connectionString = configuration[ConnectionStringSetting];
        return Configure(builder, provider, string.IsNullOrWhiteSpace(connectionString) ? defaultConnectionString : connectionString);
    }

    /// <summary>True for the provider name <c>Postgres</c> (any case); false for null, empty or <c>Sqlite</c>.</summary>
    public static bool IsPostgres(string? provider) =>
        string.Equals(provider, PostgresProvider, StringComparison.OrdinalIgnoreCase);

    /// <summary>Configures <paramref name="builder"/> for a provider name (null or empty: Sqlite) and connection string.</summary>
    /// <exception cref="InvalidOperationException">An unsupported provider or a missing connection string; the message names the setting.</exception>
    public static DbContextOptionsBuilder Configure(DbContextOptionsBuilder builder, string? provider, string? connectionString)
    {
        ArgumentNullException.ThrowIfNull(builder);
        if (IsPostgres(provider))
        {
            return ConfigurePostgres(builder, connectionString);
        }
        if (!string.IsNullOrWhiteSpace(provider) && !string.Equals(provider, SqliteProvider, StringComparison.OrdinalIgnoreCase))
        {
            throw new InvalidOperationException($"{ProviderSetting} is '{provider}', which is not supported; use '{SqliteProvider}' or '{PostgresProvider}'.");
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

    /// <summary>Options for a PostgreSQL database, for tools and tests.</summary>
    /// <exception cref="InvalidOperationException">The connection string is missing or not a valid Npgsql connection string.</exception>
    public static DbContextOptions<OpsLvpDbContext> PostgresOptions(string connectionString)
    {
        var builder = new DbContextOptionsBuilder<OpsLvpDbContext>();
        Configure(builder, PostgresProvider, connectionString);
        return builder.Options;
    }

    /// <summary>True when <paramref name="text"/> reads as an Npgsql connection string with a host (e.g. <c>Host=db;Database=opslvp</c>), not a file path.</summary>
    public static bool LooksLikePostgres(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (!text.Contains('=', StringComparison.Ordinal))
        {
            return false;
        }
        try
        {
            return !string.IsNullOrWhiteSpace(new NpgsqlConnectionStringBuilder(text).Host);
        }
        catch (ArgumentException)
        {
            return false;
        }
    }

    private static DbContextOptionsBuilder ConfigurePostgres(DbContextOptionsBuilder builder, string? connectionString)
    {
        if (string.IsNullOrWhiteSpace(connectionString))
        {
            throw new InvalidOperationException($"{PostgresConnectionStringSetting} is not set (e.g. 'Host=db;Database=opslvp;Username=opslvp;Password=...').");
        }
        NpgsqlConnectionStringBuilder parsed;
        try
        {
            parsed = new NpgsqlConnectionStringBuilder(connectionString);
        }
        catch (ArgumentException ex)
        {
            throw new InvalidOperationException($"{PostgresConnectionStringSetting} is not a valid PostgreSQL connection string: {ex.Message}", ex);
        }
        if (string.IsNullOrWhiteSpace(parsed.Host))
        {
            throw new InvalidOperationException($"{PostgresConnectionStringSetting} names no Host.");
        }
        return builder.UseNpgsql(parsed.ConnectionString, o => o.MigrationsAssembly(PostgresMigrationsAssembly));
    }

    /// <summary>Options for a SQLite file, for tools and tests.</summary>
    public static DbContextOptions<OpsLvpDbContext> SqliteOptions(string connectionString)
    {
        var builder = new DbContextOptionsBuilder<OpsLvpDbContext>();
        Configure(builder, SqliteProvider, connectionString);
        return builder.Options;
    }
}
