using OpsLvp.FaultCases;

namespace OpsLvp.Web.Tests.Faults;

/// <summary>A test that makes an ext4 filesystem on a loop device: skipped, saying why, without root, mkfs.ext4 or loop devices.</summary>
public sealed class LoopFactAttribute : FactAttribute
{
    public LoopFactAttribute()
    {
        if (LoopFilesystem.CannotMount() is { } why)
        {
            Skip = why;
        }
    }
}
