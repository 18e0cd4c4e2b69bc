using OpsLvp.FaultCases;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Faults;

/// <summary>
/// A test that makes an ext4 filesystem on a loop device. Without root or mkfs.ext4 it is skipped, saying why, except
/// with <c>OPSLVP_REQUIRE_SERVICES=1</c> (set by <c>.ci/run</c>, which installs e2fsprogs), where
/// <see cref="EnsureCanMount"/> fails it with the reason, so a missing prerequisite cannot pass for a success. A kernel or
/// sandbox that refuses loop devices (a container without loop device nodes: no package mends it) skips it in every run,
/// with that reason in the test output.
/// </summary>
public sealed class LoopFactAttribute : FactAttribute
{
    public LoopFactAttribute()
    {
        if (LoopFilesystem.CannotInstall() is { } why)
        {
            if (!LocalServices.Required)
            {
                Skip = why + $"; set {LocalServices.RequireVariable}=1 to fail instead";
            }
        }
        else if (LoopFilesystem.CannotMount() is { } refused)
        {
            Skip = refused;
        }
    }

    /// <summary>Fails the test with the reason when a prerequisite an installer could mend is missing.</summary>
    public static void EnsureCanMount()
    {
        if (LoopFilesystem.CannotInstall() is { } why)
        {
            Assert.Fail($"{LocalServices.RequireVariable}=1 and the loop ext4 filesystem cannot be made: {why}");
        }
    }
}
