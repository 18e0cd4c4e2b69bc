using Microsoft.EntityFrameworkCore.Design;

namespace OpsLvp.Data.Postgres;

/// <summary>
/// Lets <c>dotnet ef migrations add X --project src/OpsLvp.Data.Postgres</c> build the PostgreSQL model without a
/// host; the connection string is only used by <c>dotnet ef database update</c> (override with OPSLVP_PG_DESIGN).
/// </summary>
public sealed class PostgresDesignTimeDbContextFactory : IDesignTimeDbContextFactory<OpsLvpDbContext>
{
    public OpsLvpDbContext CreateDbContext(string[] args) =>
        new(OpsLvpDatabase.PostgresOptions(Environment.GetEnvironmentVariable("OPSLVP_PG_DESIGN") ?? "Host=127.0.0.1;Database=opslvp_design"));
}
