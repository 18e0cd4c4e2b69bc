using System.Globalization;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Optics;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>
/// Everything the duty console prints, computed from one <see cref="LiveSnapshot"/>, the server's clock and the
/// signed-in caller. The page only lays it out; every label, class, count and time is decided here so it can be unit
/// tested. Holds no LVP decision: phases, safeguards, waits and staleness come from the engine as they are; words
/// from <see cref="LvpVocabulary"/>, times and values from <see cref="DisplayFormat"/>.
/// </summary>
public sealed class ConsoleViewModel
{
    private ConsoleViewModel()
    {
    }

    /// <summary>"LVP IN FORCE".</summary>
    public required string PhaseText { get; init; }

    /// <summary>"phase-active": the chip's class from the state's tone (the palette shared with the tablet).</summary>
    public required string PhaseClass { get; init; }

    /// <summary>"since 03:00:00Z (5 min)".</summary>
    public required string PhaseSince { get; init; }

    /// <summary>"episode XDMO-…" or "no episode running".</summary>
    public required string EpisodeText { get; init; }

    /// <summary>"safeguards incomplete, outstanding: Suspend airside works; Check stop bars".</summary>
    public required string SafeguardsText { get; init; }

    /// <summary>Notes beside the phase (<see cref="StatusNotes"/>), open safeguards named by their texts.</summary>
    public required IReadOnlyList<string> PhaseNotes { get; init; }

    public required bool IsDutyManager { get; init; }

    /// <summary>"Signed in as viv: view only (duty managers act here)"; null for a duty manager.</summary>
    public required string? ReadOnlyText { get; init; }

    /// <summary>"500 m at 07 TDZ (RVR07T)" or "UNKNOWN".</summary>
    public required string GoverningRvrText { get; init; }

    /// <summary>"300 ft (CEIL1)", "UNKNOWN", or null when the aerodrome has no ceilometer (docs/engine.md R5).</summary>
    public required string? CeilingText { get; init; }

    public required bool ForecastOn { get; init; }

    /// <summary>"Set deterioration forecast…" or "Clear forecast…".</summary>
    public required string ForecastButton { get; init; }

    public required string LightStepText { get; init; }

    /// <summary>"LVP preparation declared by dana at 03:00Z: precaution" or "none".</summary>
    public required string HoldText { get; init; }

    public required bool ShowReleaseHold { get; init; }

    /// <summary>Declaring in force over open safeguards is offered while the phase is not active.</summary>
    public required bool ShowOverride { get; init; }

    public required IReadOnlyList<ConsoleRunway> Runways { get; init; }

    public required IReadOnlyList<string> Waiting { get; init; }

    public required ConsolePending? Pending { get; init; }

    public required IReadOnlyList<ConsoleSafeguard> Safeguards { get; init; }

    public required IReadOnlyList<ConsoleLightStep> LightSteps { get; init; }

    public required IReadOnlyList<ConsoleSensor> Sensors { get; init; }

    /// <summary>"LVP preparation items by team", or "Checklists by team" in normal.</summary>
    public required string TeamsTitle { get; init; }

    /// <summary>Per team, the current phase's items only.</summary>
    public required IReadOnlyList<ConsoleTeam> Teams { get; init; }

    /// <summary>"no items in this phase" when <see cref="Teams"/> is empty.</summary>
    public required string TeamsEmptyText { get; init; }

    public static ConsoleViewModel Build(LiveSnapshot snapshot, DateTimeOffset now, CommandCaller caller)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        ArgumentNullException.ThrowIfNull(caller);
        var status = snapshot.Status;
        var isDutyManager = caller.IsInRole(Roles.DutyManager);
        Func<string, string?> itemText = snapshot.ItemText;
        var phaseWords = LvpVocabulary.For(status);
        return new ConsoleViewModel
        {
            PhaseText = phaseWords.Headline,
            PhaseClass = "phase-" + phaseWords.Tone.ToString().ToLowerInvariant(),
            PhaseSince = $"since {DisplayFormat.UtcClockSeconds(status.PhaseSince)} ({DisplayFormat.Duration(now - status.PhaseSince)})",
            EpisodeText = status.Episode is { } e ? $"episode {e.Id}" : "no episode running",
            SafeguardsText = SafeguardsLine(status, itemText),
            PhaseNotes = StatusNotes.For(status, itemText),
            IsDutyManager = isDutyManager,
            ReadOnlyText = isDutyManager ? null
                : caller.Authenticated ? $"Signed in as {caller.Name}: view only (duty managers act here)" : "Not signed in: view only",
            GoverningRvrText = status.GoverningRvr is { } rvr
                ? $"{ReadingFlagText.ValuePrefix(rvr.Flags)}{DisplayFormat.Rvr(rvr.Value)} at {rvr.Label} ({rvr.SensorId}){(rvr.Flags == ReadingFlags.None ? "" : " — " + ReadingFlagText.Describe(rvr.Flags))}"
                : "UNKNOWN",
            CeilingText = !status.CeilingConfigured ? null : status.Ceiling is { } c ? $"{DisplayFormat.Feet(c.Value)} ({c.SensorId})" : "UNKNOWN",
            ForecastOn = status.DeteriorationForecast,
            ForecastButton = status.DeteriorationForecast ? "Clear forecast…" : "Set deterioration forecast…",
            LightStepText = LightStepLine(snapshot.LightStep),
            HoldText = status.Hold is { } h ? $"{LvpVocabulary.For(h.Phase).Name} declared by {h.Actor} at {DisplayFormat.UtcClock(h.Since)}: {h.Reason}" : "none",
            ShowReleaseHold = status.Hold is not null,
            ShowOverride = status.Phase != Phase.Active,
            Runways = status.Runways.Select(r => new ConsoleRunway($"RWY {r.Direction}", r.Positions.Select(Position).ToList())).ToList(),
            Waiting = status.Waiting.Select(w => WaitWords.Text(w, itemText)).ToList(),
            Pending = status.Pending is { } p
                ? new ConsolePending(
                    $"{LvpVocabulary.Change(p.From, p.To)}: {p.Reason}",
                    $"proposed {DisplayFormat.UtcClockSeconds(p.ConditionMetAt)}, pending for {DisplayFormat.Duration(now - p.ConditionMetAt)}",
                    $"Confirm {LvpVocabulary.For(p.To).Name}…")
                : null,
            Safeguards = status.Episode is null ? []
                : status.SafeguardsOutstanding.Select(id => itemText(id) ?? id).Zip(status.SafeguardsOutstanding)
                    .Select(t => new ConsoleSafeguard(t.Second, t.First, $"{t.First}: not applicable…")).ToList(),
            LightSteps = (snapshot.LightSteps ?? []).Select(step => new ConsoleLightStep(step, step == 0 ? "Step 0 (off)…" : $"Step {step}…")).ToList(),
            Sensors = SensorIds(snapshot).Select(id => snapshot.OutOfService.Contains(id)
                    ? new ConsoleSensor(id, true, $"{id} (out of service)", "Back in service…", "oos")
                    : new ConsoleSensor(id, false, id, "Out of service…", ""))
                .ToList(),
            TeamsTitle = status.Episode is null ? "Checklists by team" : $"{LvpVocabulary.For(status.Phase).Name} items by team",
            Teams = TeamProgress.For(snapshot.Items, status.Phase).Select(Team).ToList(),
            TeamsEmptyText = status.Episode is null ? "no items: no episode running" : "no items in this phase",
        };
    }

    /// <summary>The item's text from the snapshot (the latest instance), or null when the snapshot does not list it.</summary>

    private static string SafeguardsLine(EngineStatus status, Func<string, string?> itemText)
    {
        if (status.Episode is null)
        {
            return "safeguards: not applicable (normal operations)";
        }
        if (status.SafeguardsComplete)
        {
            return "safeguards complete";
        }
        if (status.SafeguardsOutstanding.Count == 0)
        {
            return "safeguards incomplete";
        }
        return $"safeguards incomplete, outstanding: {string.Join("; ", status.SafeguardsOutstanding.Select(id => itemText(id) ?? id))}";
    }

    private static ConsolePosition Position(PositionRvr p) => new(
        p.Position.ToString().ToUpperInvariant(),
        p switch
        {
            { SensorId: null } => "—",
            { OutOfService: true } => "OOS",
            { Reading: null } => "no data",
            { Reading: { Stale: true } } => "stale",
            { Reading: { } r } => DisplayFormat.Rvr(r.Value),
        },
        p.OutOfService ? "oos" : "");

    private static ConsoleTeam Team(TeamProgress t)
    {
        var count = $"{t.Done} of {t.Total} done{(t.Overdue > 0 ? $" · {t.Overdue} overdue" : "")}";
        return new ConsoleTeam(
            t.Team, t.TeamName, count, $"{t.TeamName}: {count}",
            t.Total == 0 ? 0 : Math.Round(100.0 * t.Done / t.Total, 1), t.Overdue > 0, t.Overdue > 0 ? "overdue" : "");
    }

    /// <summary>Sensors the console can mark: those standing at an LVP runway position, the ceilometer in use, and any already out of service.</summary>
    private static IEnumerable<string> SensorIds(LiveSnapshot s) =>
        s.Status.Runways.SelectMany(r => r.Positions).Select(p => p.SensorId)
            .Append(s.Status.Ceiling?.SensorId)
            .Concat(s.OutOfService)
            .OfType<string>()
            .Distinct(StringComparer.Ordinal)
            .Order(StringComparer.Ordinal);

    /// <summary>"3 (set by kim at 06:10Z)", "0, lights off (lighting sensor LGT1)", "unknown (lighting sensor LGT1 stale) — lowest configured intensity used".</summary>
    internal static string LightStepLine(LightStepInUse? use)
    {
        if (use is null)
        {
            return "—";
        }
        var step = use.Step is { } v ? (v == 0 ? "0, lights off" : v.ToString("0.##", CultureInfo.InvariantCulture)) : "unknown";
        var origin = use.Origin switch
        {
            LightStepOrigin.Manual => $"set by {use.Source}{(use.Since is { } at ? " at " + DisplayFormat.UtcClock(at) : "")}",
            LightStepOrigin.Sensor => use.Step is null ? $"lighting sensor {use.Source} stale" : $"lighting sensor {use.Source}",
            _ => "profile starting value",
        };
        return $"{step} ({origin}){(use.Unknown ? " — lowest configured intensity used" : "")}";
    }
}
