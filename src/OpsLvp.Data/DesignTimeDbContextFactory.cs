using Microsoft.EntityFrameworkCore.Design;

namespace OpsLvp.Data;

/// <summary>
/// Lets <c>dotnet ef migrations add X --project src/OpsLvp.Data</c> build the model without a host. The file named
/// here is only opened by <c>dotnet ef database update</c>.
/// </summary>
public sealed class DesignTimeDbContextFactory : IDesignTimeDbContextFactory<OpsLvpDbContext>
{
    public OpsLvpDbContext CreateDbContext(string[] args) => new(OpsLvpDatabase.SqliteOptions("Data Source=opslvp-design.db"));
}
