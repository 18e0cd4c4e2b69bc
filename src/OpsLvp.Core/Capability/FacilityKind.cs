namespace OpsLvp.Core.Capability;

/// <summary>What a facility is (docs/capability.md). The kinds low-visibility operations depend on: ICAO Annex 14 Vol I ch. 5 and 8 (from memory).</summary>
public enum FacilityKind
{
    /// <summary>Instrument landing system; its category is <see cref="FacilityConfig.IlsCategory"/>.</summary>
    Ils,
    ApproachLighting,
    CentrelineLights,
    TdzLights,
    StopBars,
    /// <summary>Standby power; its switch-over time is <see cref="FacilityConfig.SwitchOverSeconds"/>.</summary>
    StandbyPower,
    /// <summary>An RVR sensor (<see cref="FacilityConfig.Sensor"/>): unserviceable, its position counts as out of service.</summary>
    RvrSensor,
    /// <summary>Anything else the aerodrome's instruction names.</summary>
    Other,
}
