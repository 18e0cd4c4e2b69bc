using OpsLvp.Core.Engine;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Live;

/// <summary>
/// Everything a screen shows, as one immutable value pushed on every change: to Blazor circuits through
/// <see cref="ILiveState"/> and to external clients as the hub's <c>state</c> message and <c>GET /api/state</c>.
/// Built by the engine host from the engine state; components only render it.
/// </summary>
/// <param name="Version">Increases with every published change (never reused after a restart).</param>
/// <param name="At">The instant it describes (app clock, demo time in demo mode).</param>
/// <param name="Aerodrome">Who and which profile.</param>
/// <param name="Status">The engine's view: phase, conditions, runways, thresholds, waiting-for, alarms.</param>
/// <param name="Items">Checklist items of the running episode with their texts and team names.</param>
/// <param name="OutOfService">Sensors an operator marked out of service.</param>
/// <param name="Feeds">Per-feed health.</param>
/// <param name="Trends">Per RVR sensor: 1-minute mean and the 10-minute U/D/N tendency (ICAO Annex 3, App 3, §4.3.6.6).</param>
/// <param name="Demo">Set in demo mode (the "DEMO ×N" badge).</param>
/// <param name="Recording">Whether the server is recording; while it is not, the values shown are the last ones recorded
/// and screens say so (docs/reliability.md "Storage faults"). Null reads as recording.</param>
/// <param name="LightStep">The runway-light step in use and its origin (profile, lighting sensor, or set by a duty
/// manager; docs/engine.md R20). Null when the host did not say.</param>
/// <param name="LightSteps">The steps a duty manager may set: 0 (lights off) and the profile's configured steps.</param>
public sealed record LiveSnapshot(
    long Version,
    DateTimeOffset At,
    AerodromeView Aerodrome,
    EngineStatus Status,
    IReadOnlyList<ChecklistItemView> Items,
    IReadOnlyList<string> OutOfService,
    IReadOnlyList<FeedHealthDto> Feeds,
    IReadOnlyList<SensorTrend> Trends,
    DemoView? Demo,
    RecordingView? Recording = null,
    OpsLvp.Core.Optics.LightStepInUse? LightStep = null,
    IReadOnlyList<int>? LightSteps = null)
{
    /// <summary>The text of a checklist item of the running episode, or null (screens name items by text, not id).</summary>
    public string? ItemText(string itemId) => Items.LastOrDefault(i => i.ItemId == itemId)?.Text;
}
