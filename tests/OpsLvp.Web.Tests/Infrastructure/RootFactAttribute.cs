using OpsLvp.FaultCases;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>
/// A test that mounts a small filesystem (<see cref="SmallMount"/>): skipped, saying why, unless the process runs as
/// root on Linux. CI runs as root (it installs packages), so there these tests run.
/// </summary>
public sealed class RootFactAttribute : FactAttribute
{
    public RootFactAttribute()
    {
        if (SmallMount.CannotMount() is { } why)
        {
            Skip = why;
        }
    }
}
