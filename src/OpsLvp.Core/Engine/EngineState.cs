using System.Collections.Immutable;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>
/// Everything the engine knows, as an immutable value: the engine is a pure function
/// (state, inputs, now) → (state, events). Serialisable to JSON so the server can persist it and
/// resume after a restart (running dwells included, since they are stored as start instants).
/// </summary>
public sealed record EngineState
{
    /// <summary>The instant up to which this state has been evaluated (UTC).</summary>
    public required DateTimeOffset EvaluatedAt { get; init; }

    public Phase Phase { get; init; } = Phase.Normal;

    /// <summary>When monitoring began (engine start); a sensor that never reported is silent from here + its maximum age. Null: <see cref="PhaseSince"/>.</summary>
    public DateTimeOffset? MonitoringSince { get; init; }

    /// <summary>When the current phase was entered.</summary>
    public required DateTimeOffset PhaseSince { get; init; }

    /// <summary>The running episode (leaving normal until back to normal); null in normal.</summary>
    public Episode? Episode { get; init; }

    /// <summary>Latest accepted reading per sensor and kind (key: <see cref="SensorKey"/>).</summary>
    public ImmutableDictionary<string, Reading> Latest { get; init; } = ImmutableDictionary<string, Reading>.Empty;

    /// <summary>Sensors an operator marked out of service.</summary>
    public ImmutableHashSet<string> OutOfService { get; init; } = ImmutableHashSet<string>.Empty;

    /// <summary>Deterioration forecast flag (docs/engine.md R4).</summary>
    public bool DeteriorationForecast { get; init; }

    /// <summary>Forecasts held: received, not expired (docs/engine.md R25, R28), oldest first.</summary>
    public ImmutableList<HeldForecast> Forecasts { get; init; } = ImmutableList<HeldForecast>.Empty;

    /// <summary>The duty manager's manual forecast setting, until released or a newer forecast arrives (docs/engine.md R27); null otherwise.</summary>
    public ManualForecast? ManualForecast { get; init; }

    /// <summary>What decides <see cref="DeteriorationForecast"/> now: a forecast part or a manual setting (docs/engine.md R26, R27); null when off by forecasts.</summary>
    public ForecastFlagSource? ForecastSource { get; init; }

    /// <summary>The runway-light step last set by a duty manager (docs/engine.md R20); null while none was set.</summary>
    public ManualLightStep? ManualLightStep { get; init; }

    /// <summary>A declared phase below which the engine does not relax automatically (docs/engine.md R9).</summary>
    public Hold? Hold { get; init; }

    /// <summary>Start instants of conditions that currently hold continuously (dwell timers, docs/engine.md R7).</summary>
    public ImmutableDictionary<ConditionKind, DateTimeOffset> HoldingSince { get; init; } = ImmutableDictionary<ConditionKind, DateTimeOffset>.Empty;

    /// <summary>After a manual relaxation, escalation dwells are measured from no earlier than this (docs/engine.md R9).</summary>
    public DateTimeOffset? EscalationMeasuredFrom { get; init; }

    /// <summary>A transition waiting for a duty manager's confirmation (docs/engine.md R10).</summary>
    public PendingTransition? Pending { get; init; }

    /// <summary>Checklist items of the running episode, open and closed (docs/engine.md R11).</summary>
    public ImmutableList<ChecklistItemState> Items { get; init; } = ImmutableList<ChecklistItemState>.Empty;

    /// <summary>Active declared while safeguards were open, with the duty manager's reason (docs/engine.md R13); null otherwise.</summary>
    public SafeguardsOverride? SafeguardsOverride { get; init; }

    /// <summary>The last manual relaxation made against the conditions, until they agree (docs/engine.md R15); null otherwise.</summary>
    public Relaxation? RelaxedAgainstConditions { get; init; }

    /// <summary>Alarms raised and not yet cleared (acknowledged ones included).</summary>
    public ImmutableList<Alarm> Alarms { get; init; } = ImmutableList<Alarm>.Empty;

    /// <summary>Reported facility status per facility id (docs/engine.md R30); a facility with no entry is serviceable.</summary>
    public ImmutableDictionary<string, Capability.FacilityState> Facilities { get; init; } = ImmutableDictionary<string, Capability.FacilityState>.Empty;

    /// <summary>Direction in use per runway id as set by a duty manager (docs/engine.md R34); a runway with no entry uses the profile's.</summary>
    public ImmutableDictionary<string, string> DirectionsInUse { get; init; } = ImmutableDictionary<string, string>.Empty;

    /// <summary>Observer RVR per <see cref="Engine.ObserverRvr.KeyOf"/> (docs/engine.md R35), kept until replaced (it counts only while fresh).</summary>
    public ImmutableDictionary<string, ObserverRvr> ObserverRvr { get; init; } = ImmutableDictionary<string, ObserverRvr>.Empty;

    /// <summary>The capability per runway direction at <see cref="EvaluatedAt"/> (docs/engine.md R31); null when the profile has no capability section.</summary>
    public IReadOnlyList<Capability.RunwayCapability>? Capability { get; init; }

    /// <summary>Headlines before a downgrade of a direction in use, per direction, while the downgrade alarm stands (docs/engine.md R37).</summary>
    public ImmutableDictionary<string, CapabilityBaseline> CapabilityDowngrades { get; init; } = ImmutableDictionary<string, CapabilityBaseline>.Empty;

    /// <summary>The key of <see cref="Latest"/> for a sensor and kind.</summary>
    public static string SensorKey(string sensorId, ReadingKind kind) => $"{sensorId}|{kind}";
}
