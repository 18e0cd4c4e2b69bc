namespace OpsLvp.Core.Readings;

/// <summary>
/// What a reading's value stands for besides the number (docs/engine.md R19–R22). A flagged value is still used as a
/// value by the engine; each flag marks the conservative side it was taken from, and screens and events say so.
/// </summary>
[Flags]
public enum ReadingFlags
{
    /// <summary>A value as measured or reported.</summary>
    None = 0,

    /// <summary>
    /// The quantity is this value or more (a lower bound), e.g. "RVR 1500 m or more" from a METAR without an RVR
    /// group (docs/engine.md R22). Used as the value itself, the lower end, which can only escalate.
    /// </summary>
    OrMore = 1,

    /// <summary>
    /// RVR derived with no fresh background luminance: the illuminance threshold giving the lowest lights range was
    /// used (docs/engine.md R19), so the value may be lower than the RVR actually is.
    /// </summary>
    LuminanceUnknown = 2,

    /// <summary>
    /// RVR derived with the runway-light step in use unknown: the lowest configured intensity was used
    /// (docs/engine.md R20), so the value may be lower than the RVR actually is.
    /// </summary>
    LightStepUnknown = 4,
}
