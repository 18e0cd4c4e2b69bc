using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// A fact that needs Chromium and PostgreSQL (nodes on one throwaway database): skipped, saying why, when either is
/// missing, unless the run requires them (<c>OPSLVP_REQUIRE_BROWSER=1</c>, <c>OPSLVP_REQUIRE_SERVICES=1</c>), when it
/// fails instead.
/// </summary>
[AttributeUsage(AttributeTargets.Method, AllowMultiple = false)]
public sealed class BrowserPostgresFactAttribute : FactAttribute
{
    public BrowserPostgresFactAttribute()
    {
        if ((ChromiumLocator.SkipReason ?? LocalServices.PostgresSkipReason) is { } reason)
        {
            Skip = reason;
        }
    }
}
