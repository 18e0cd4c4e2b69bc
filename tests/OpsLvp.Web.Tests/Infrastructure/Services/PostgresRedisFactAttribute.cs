namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>A test on a throwaway PostgreSQL cluster and a throwaway redis-server: skipped, saying why, when either is missing, unless OPSLVP_REQUIRE_SERVICES=1.</summary>
public sealed class PostgresRedisFactAttribute : FactAttribute
{
    public PostgresRedisFactAttribute()
    {
        Skip = LocalServices.PostgresSkipReason ?? LocalServices.RedisSkipReason;
    }
}
