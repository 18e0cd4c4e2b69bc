namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>A test on a throwaway redis-server (<see cref="RedisServerProcess"/>): skipped, saying why, when it is missing, unless OPSLVP_REQUIRE_SERVICES=1.</summary>
public sealed class RedisFactAttribute : FactAttribute
{
    public RedisFactAttribute()
    {
        Skip = LocalServices.RedisSkipReason;
    }
}
