namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>A test on a throwaway PostgreSQL cluster (<see cref="PostgresCluster"/>): skipped, saying why, when the server programs are missing, unless OPSLVP_REQUIRE_SERVICES=1.</summary>
public sealed class PostgresFactAttribute : FactAttribute
{
    public PostgresFactAttribute()
    {
        Skip = LocalServices.PostgresSkipReason;
    }
}
