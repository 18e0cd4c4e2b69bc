namespace OpsLvp.Benchmarks.Live;

/// <summary>Where the hub clients that measure push latency run.</summary>
public enum ClientHost
{
    /// <summary>In the process of the servers (the push suite; push-ha with <c>--clients-in-process</c>).</summary>
    InProcess,

    /// <summary>In a second process, this program started again with <see cref="ProbeProcess.RoleArguments"/> (push-ha's default).</summary>
    OwnProcess,
}
