using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>A fact that needs Chromium and nginx (<see cref="NginxProcess"/>): skipped, saying why, when either is missing, unless the run requires them.</summary>
[AttributeUsage(AttributeTargets.Method, AllowMultiple = false)]
public sealed class BrowserNginxFactAttribute : FactAttribute
{
    public BrowserNginxFactAttribute()
    {
        if ((ChromiumLocator.SkipReason ?? NginxProcess.SkipReason) is { } reason)
        {
            Skip = reason;
        }
    }
}
