namespace OpsLvp.Core.Capability;

/// <summary>Where an RVR value for a capability came from.</summary>
public enum RvrSource
{
    Sensor,
    /// <summary>An observer's assessment (common practice: counting runway edge lights), labelled "observer" everywhere.</summary>
    Observer,
}
