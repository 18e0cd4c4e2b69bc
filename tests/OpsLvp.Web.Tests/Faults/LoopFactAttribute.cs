using OpsLvp.FaultCases;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Faults;

/// <summary>
/// A test that makes an ext4 filesystem on a loop device: skipped, saying why, without root, mkfs.ext4 or loop devices;
/// with <c>OPSLVP_REQUIRE_SERVICES=1</c> (set by <c>.ci/run</c>, which installs e2fsprogs) it runs and
/// <see cref="EnsureCanMount"/> fails it with the same reason instead, so a missing prerequisite cannot pass for a success.
/// </summary>
public sealed class LoopFactAttribute : FactAttribute
{
    public LoopFactAttribute()
    {
        if (LoopFilesystem.CannotMount() is { } why && !LocalServices.Required)
        {
            Skip = why + $"; set {LocalServices.RequireVariable}=1 to fail instead";
        }
    }

    /// <summary>Fails the test with the reason when this machine cannot make and mount a loop ext4 filesystem.</summary>
    public static void EnsureCanMount()
    {
        if (LoopFilesystem.CannotMount() is { } why)
        {
            Assert.Fail($"{LocalServices.RequireVariable}=1 and the loop ext4 filesystem cannot be made: {why}");
        }
    }
}
