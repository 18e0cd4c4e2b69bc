using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

/// <summary>What a display shows at an instant (from <see cref="LvpEngine.Describe"/>); holds no decision logic of its own.</summary>
/// <param name="GoverningRvr">Lowest fresh governing RVR, null when unknown.</param>
/// <param name="Ceiling">Lowest fresh ceiling, null when unknown or when no ceilometer is configured.</param>
/// <param name="CeilingConfigured">False for an aerodrome without ceilometers (ceiling left out, docs/engine.md R5).</param>
/// <param name="Runways">Per LVP runway, the RVR at TDZ/MID/END for the direction in use.</param>
/// <param name="Thresholds">The thresholds in effect.</param>
/// <param name="Waiting">What the engine is waiting for, as data and text.</param>
/// <param name="At">The instant (UTC).</param>
/// <param name="Phase">The current phase.</param>
/// <param name="PhaseSince">When it was entered.</param>
/// <param name="Episode">The running episode, null in normal.</param>
/// <param name="DeteriorationForecast">The forecast flag (docs/engine.md R4).</param>
/// <param name="Hold">The declared hold, if any (docs/engine.md R9).</param>
/// <param name="Pending">The pending transition, if any (docs/engine.md R10).</param>
/// <param name="Alarms">Raised alarms, acknowledged ones included.</param>
public sealed record EngineStatus(
    DateTimeOffset At,
    Phase Phase,
    DateTimeOffset PhaseSince,
    Episode? Episode,
    MeasuredValue? GoverningRvr,
    MeasuredValue? Ceiling,
    bool CeilingConfigured,
    IReadOnlyList<RunwayRvrStatus> Runways,
    ThresholdSet Thresholds,
    bool DeteriorationForecast,
    Hold? Hold,
    PendingTransition? Pending,
    IReadOnlyList<Alarm> Alarms,
    IReadOnlyList<WaitingFor> Waiting)
{
    /// <summary>
    /// All mandatory preparation items of the running episode are done (<see cref="Checklists.Safeguards.AreComplete"/>);
    /// false in normal. LVP are in force only when the phase is active and this is true.
    /// </summary>
    public bool SafeguardsComplete { get; init; }

    /// <summary>Mandatory preparation items neither done nor marked not applicable (ids), empty when complete or in normal.</summary>
    public IReadOnlyList<string> SafeguardsOutstanding { get; init; } = [];

    /// <summary>
    /// The active condition has held its dwell but open safeguards keep the phase at preparation (docs/engine.md R13):
    /// screens say <see cref="LvpEngine.SafeguardsIncompleteHeadline"/> with <see cref="SafeguardsOutstanding"/>.
    /// </summary>
    public bool ConditionsMetSafeguardsIncomplete { get; init; }

    /// <summary>Active declared over open safeguards (docs/engine.md R13), shown while the phase is active; else null.</summary>
    public SafeguardsOverride? SafeguardsOverride { get; init; }

    /// <summary>The forecast flag's source, manual setting and look-ahead (docs/engine.md R29); null before any forecast or setting.</summary>
    public ForecastStatus? Forecast { get; init; }

    /// <summary>A manual relaxation against the conditions, shown beside the phase until they agree (docs/engine.md R15); else null.</summary>
    public Relaxation? RelaxedAgainstConditions { get; init; }

    /// <summary>Capability per runway direction, in-use directions first (docs/engine.md R31); null without a capability section.</summary>
    public IReadOnlyList<Capability.RunwayCapability>? Capability { get; init; }

    /// <summary>Reported facility status per facility id; a facility not listed is serviceable (docs/engine.md R30).</summary>
    public IReadOnlyDictionary<string, Capability.FacilityState> Facilities { get; init; } = new Dictionary<string, Capability.FacilityState>();

    /// <summary>Observer RVR values entered, fresh or not, with who and when (docs/engine.md R35).</summary>
    public IReadOnlyList<ObserverRvr> ObserverRvr { get; init; } = [];

    /// <summary>The profile's facilities (docs/capability.md), for boards that report on them; empty without a capability section.</summary>
    public IReadOnlyList<Capability.FacilityConfig> FacilityConfigs { get; init; } = [];

    /// <summary>Direction in use per runway id, every runway of the profile (docs/engine.md R34).</summary>
    public IReadOnlyDictionary<string, string> DirectionsInUse { get; init; } = new Dictionary<string, string>();

    /// <summary>The profile's directions per runway id (runway ids are names, not "07L/25R" to split), for "use direction" choices.</summary>
    public IReadOnlyDictionary<string, IReadOnlyList<string>> RunwayDirections { get; init; } = new Dictionary<string, IReadOnlyList<string>>();
}
