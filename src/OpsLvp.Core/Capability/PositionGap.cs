namespace OpsLvp.Core.Capability;

/// <summary>Why an RVR position has no value.</summary>
public enum PositionGap
{
    /// <summary>No sensor stands at the position for that direction.</summary>
    NoSensor,
    /// <summary>The sensor has no fresh reading (docs/engine.md R2).</summary>
    Silent,
    /// <summary>The sensor is marked out of service, or its facility is unserviceable.</summary>
    OutOfService,
}
