using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// A fact that needs Chromium, nginx, PostgreSQL and redis-server (two nodes behind the repository's nginx): skipped,
/// saying why, when any is missing, unless the run requires them (<c>OPSLVP_REQUIRE_BROWSER=1</c>,
/// <c>OPSLVP_REQUIRE_SERVICES=1</c>), when it fails instead.
/// </summary>
[AttributeUsage(AttributeTargets.Method, AllowMultiple = false)]
public sealed class BrowserClusterFactAttribute : FactAttribute
{
    public BrowserClusterFactAttribute()
    {
        if ((ChromiumLocator.SkipReason ?? NginxProcess.SkipReason ?? LocalServices.PostgresSkipReason ?? LocalServices.RedisSkipReason) is { } reason)
        {
            Skip = reason;
        }
    }
}
