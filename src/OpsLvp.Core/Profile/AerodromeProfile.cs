using System.Text.Json.Serialization;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Profile;

/// <summary>
/// The aerodrome's own LVP configuration: every threshold, dwell and checklist here is a local value
/// set by the aerodrome's approved LVP instruction. Loaded from JSON by <see cref="ProfileLoader"/> and
/// checked by <c>ProfileValidator</c> (docs/engine.md R6). Documented in docs/profile.md.
/// </summary>
public sealed record AerodromeProfile
{
    /// <summary>Version label of this profile (recorded with every transition and export).</summary>
    public required string Version { get; init; }

    public required AerodromeInfo Aerodrome { get; init; }

    public IReadOnlyList<RunwayConfig> Runways { get; init; } = [];

    public IReadOnlyList<SensorConfig> Sensors { get; init; } = [];

    public IReadOnlyList<TeamConfig> Teams { get; init; } = [];

    public LightsConfig Lights { get; init; } = new();

    /// <summary>Maximum age of a reading per kind before it is stale (docs/engine.md R2).</summary>
    public IReadOnlyDictionary<ReadingKind, int> MaxAgeSeconds { get; init; } = new Dictionary<ReadingKind, int>();

    /// <summary>RVR positions whose readings govern the phase (docs/engine.md R3), e.g. TDZ, MID, END.</summary>
    public IReadOnlyList<RvrPosition> GoverningPositions { get; init; } = [RvrPosition.Tdz, RvrPosition.Mid, RvrPosition.End];

    /// <summary>Whether vertical visibility counts as ceiling (local practice; on by default).</summary>
    public bool VerticalVisibilityIsCeiling { get; init; } = true;

    /// <summary>Allowed clock skew for readings timed in the future, seconds (docs/engine.md R1).</summary>
    public int FutureSkewSeconds { get; init; } = 5;

    /// <summary>
    /// Minutes without a touch or key after which a shared tablet's actions page signs its person out, so the next
    /// person never ticks under the previous one's name (issue 13). 1 to 240; default 10.
    /// </summary>
    public int TabletIdleSignOutMinutes { get; init; } = 10;

    public required ThresholdSet Thresholds { get; init; }

    /// <summary>
    /// Transitions that need a duty manager's confirmation (docs/engine.md R10); the rest are automatic. Required in
    /// profile JSON (an empty list allowed) so each aerodrome decides explicitly.
    /// </summary>
    [JsonRequired]
    public IReadOnlyList<TransitionRule> Confirm { get; init; } = [];

    /// <summary>
    /// Whether LVP are in force (phase active) only once safeguards are complete: every mandatory preparation item
    /// done or marked not applicable (docs/engine.md R13). Default true; false is a local choice that lets the active
    /// condition alone enter active.
    /// </summary>
    public bool InForceNeedsSafeguards { get; init; } = true;

    public ChecklistSet Checklists { get; init; } = new();

    /// <summary>Optional: when forecasts (TAF, TREND) count as deterioration (docs/forecasts.md); null when not set.</summary>
    public ForecastSettings? Forecast { get; init; }

    /// <summary>Optional: facilities and the operations each runway direction offers (docs/capability.md); null when not set.</summary>
    public Capability.CapabilityProfile? Capability { get; init; }
}
