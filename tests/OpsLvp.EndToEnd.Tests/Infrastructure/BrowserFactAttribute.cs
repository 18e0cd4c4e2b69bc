namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>A fact that needs Chromium: skipped when none is installed, unless the run requires a browser.</summary>
[AttributeUsage(AttributeTargets.Method, AllowMultiple = false)]
public sealed class BrowserFactAttribute : FactAttribute
{
    public BrowserFactAttribute()
    {
        if (ChromiumLocator.SkipReason is { } reason)
        {
            Skip = reason;
        }
    }
}
