using OpsLvp.FaultCases;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// A browser fact that also mounts a small filesystem (<see cref="SmallMount"/>): skipped, saying why, without Chromium
/// (unless the run requires a browser) or unless the process runs as root on Linux.
/// </summary>
[AttributeUsage(AttributeTargets.Method, AllowMultiple = false)]
public sealed class BrowserRootFactAttribute : FactAttribute
{
    public BrowserRootFactAttribute()
    {
        if (ChromiumLocator.SkipReason is { } reason)
        {
            Skip = reason;
        }
        else if (SmallMount.CannotMount() is { } why)
        {
            Skip = why;
        }
    }
}
