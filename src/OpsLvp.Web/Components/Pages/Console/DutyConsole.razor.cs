using System.Globalization;
using Microsoft.AspNetCore.Components;
using Microsoft.AspNetCore.Components.Authorization;
using MudBlazor;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Shared;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>
/// The duty manager's console: condition summary, what the engine waits for, the pending transition, the
/// declare/cancel/hold/forecast/light-step/sensor actions (each asking a reason in a dialog) and each team's progress.
/// Buttons show only for duty managers; the command service decides and its outcome is shown as a snackbar.
/// </summary>
public partial class DutyConsole : LiveComponentBase
{
    private CommandCaller _caller = CommandCaller.Anonymous;
    private LiveSnapshot? _snapshot;
    private IReadOnlyList<TeamProgress> _progress = [];
    private bool _isDutyManager;

    [Inject]
    private ILvpCommandService Commands { get; set; } = default!;

    [Inject]
    private IDialogService Dialogs { get; set; } = default!;

    [Inject]
    private ISnackbar Snackbar { get; set; } = default!;

    /// <summary>The server's clock: ages and times-in-phase count from it, never from the engine's last evaluation.</summary>
    [Inject]
    private TimeProvider Clock { get; set; } = default!;

    private DateTimeOffset Now => Clock.GetUtcNow();

    [CascadingParameter]
    private Task<AuthenticationState>? AuthenticationState { get; set; }

    protected override async Task OnInitializedAsync()
    {
        if (AuthenticationState is not null)
        {
            _caller = CommandCaller.FromPrincipal((await AuthenticationState).User);
        }
        _isDutyManager = _caller.IsInRole(Roles.DutyManager);
        ShowSnapshot(Live.Current);
    }

    protected override void OnSnapshot(LiveSnapshot snapshot)
    {
        _snapshot = snapshot;
        _progress = TeamProgress.For(snapshot.Items);
    }

    /// <summary>The state's name from the one vocabulary, in capitals as on the wall.</summary>
    internal static string PhaseText(EngineStatus status) => LvpVocabulary.For(status).Headline;

    /// <summary>The chip's CSS class from the state's tone (the palette shared with the tablet).</summary>
    internal static string PhaseClass(EngineStatus status) => "phase-" + LvpVocabulary.For(status).Tone.ToString().ToLowerInvariant();

    /// <summary>The safeguards line, naming outstanding items by their texts (ids only for items the snapshot does not list).</summary>
    internal static string SafeguardsText(LiveSnapshot snapshot)
    {
        var status = snapshot.Status;
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
        var texts = status.SafeguardsOutstanding
            .Select(id => snapshot.Items.LastOrDefault(i => i.ItemId == id)?.Text ?? id);
        return $"safeguards incomplete, outstanding: {string.Join("; ", texts)}";
    }

    private static string PositionText(PositionRvr p) => p switch
    {
        { SensorId: null } => "—",
        { OutOfService: true } => "OOS",
        { Reading: null } => "no data",
        { Reading: { Stale: true } } => "stale",
        { Reading: { } r } => string.Create(CultureInfo.InvariantCulture, $"{r.Value:0} m"),
    };

    /// <summary>Sensors the console can mark: those standing at an LVP runway position, the ceilometer in use, and any already out of service.</summary>
    private static IEnumerable<string> Sensors(LiveSnapshot s) =>
        s.Status.Runways.SelectMany(r => r.Positions).Select(p => p.SensorId)
            .Append(s.Status.Ceiling?.SensorId)
            .Concat(s.OutOfService)
            .OfType<string>()
            .Distinct(StringComparer.Ordinal)
            .Order(StringComparer.Ordinal);

    private Task ConfirmPendingAsync()
    {
        if (_snapshot?.Status.Pending is not { } p)
        {
            return Task.CompletedTask;
        }
        var what = LvpVocabulary.Change(p.From, p.To);
        return AskAndRunAsync($"Confirm {what}", $"Confirm the pending transition {what} ({p.Reason}).", $"Confirm {Name(p.To)}", Color.Warning,
            reason => new ConfirmPending(_caller.Name, reason));
    }

    private Task DeclareAsync(Phase phase) =>
        AskAndRunAsync($"Declare {Name(phase)}", $"Declare {Name(phase)} now. This sets a hold: the phase will not relax automatically below {Name(phase)} until the hold is released.",
            $"Declare {Name(phase)}", phase == Phase.Active ? Color.Error : Color.Warning,
            reason => new DeclarePhase(_caller.Name, phase, reason));

    private Task DeclareOverrideAsync() =>
        AskAndRunAsync("Declare active over open safeguards",
            "Declare active although mandatory preparation items are open. The override and its reason are audited and shown on every screen until the phase leaves active.",
            "Declare active anyway", Color.Error,
            reason => new DeclarePhase(_caller.Name, Phase.Active, reason, reason));

    private Task NotApplicableAsync(string itemId) =>
        AskAndRunAsync($"Mark {itemId} not applicable",
            $"Mark the safeguard {itemId} not applicable. It then counts as done (docs/engine.md R13); the reason is audited.",
            "Not applicable", Color.Warning,
            reason => new MarkNotApplicable(_caller.Name, itemId, reason));

    private Task CancelAsync() =>
        AskAndRunAsync("Cancel LVP", "Cancel: active goes to cancellation, preparation goes to normal, even against the conditions.", "Cancel LVP", Color.Info,
            reason => new CancelLvp(_caller.Name, reason));

    private Task ReleaseHoldAsync() =>
        AskAndRunAsync("Release hold", "Release the declared hold: automatic relaxation may follow at once if its dwell has held.", "Release hold", Color.Primary,
            reason => new ReleaseHold(_caller.Name, reason));

    private Task ToggleForecastAsync()
    {
        var on = !(_snapshot?.Status.DeteriorationForecast ?? false);
        return AskAndRunAsync(on ? "Set deterioration forecast" : "Clear deterioration forecast",
            on ? "Set the deterioration forecast flag." : "Clear the deterioration forecast flag.",
            on ? "Set forecast" : "Clear forecast", Color.Primary,
            reason => new SetForecast(_caller.Name, on, reason));
    }

    private Task SetSensorAsync(string sensorId, bool currentlyOutOfService) =>
        AskAndRunAsync(currentlyOutOfService ? $"Return {sensorId} to service" : $"Take {sensorId} out of service",
            currentlyOutOfService ? $"Mark {sensorId} back in service: its readings count again." : $"Mark {sensorId} out of service: its readings no longer count.",
            currentlyOutOfService ? "Back in service" : "Out of service", Color.Primary,
            reason => new SetSensorService(_caller.Name, sensorId, currentlyOutOfService, reason));

    private Task SetLightStepAsync(int step) =>
        AskAndRunAsync($"Set runway-light step {step}",
            step == 0
                ? "Record that the runway lights are off (step 0): RVR is then the object range alone (MOR). The setting is audited and stands until a newer lighting-sensor reading."
                : $"Record that the runway lights are at step {step}: RVR uses its intensity. The setting is audited and stands until a newer lighting-sensor reading.",
            $"Set step {step}", Color.Primary,
            reason => new SetLightStep(_caller.Name, step, reason));

    /// <summary>"3 (set by kim at 06:10)", "0, lights off (lighting sensor LGT1)", "unknown (lighting sensor LGT1 stale) — lowest intensity used".</summary>
    internal static string LightStepText(OpsLvp.Core.Optics.LightStepInUse? use)
    {
        if (use is null)
        {
            return "—";
        }
        var step = use.Step is { } v ? (v == 0 ? "0, lights off" : v.ToString("0.##", CultureInfo.InvariantCulture)) : "unknown";
        var origin = use.Origin switch
        {
            OpsLvp.Core.Optics.LightStepOrigin.Manual => $"set by {use.Source}{(use.Since is { } at ? " at " + DisplayFormat.UtcClock(at) : "")}",
            OpsLvp.Core.Optics.LightStepOrigin.Sensor => use.Step is null ? $"lighting sensor {use.Source} stale" : $"lighting sensor {use.Source}",
            _ => "profile starting value",
        };
        return $"{step} ({origin}){(use.Unknown ? " — lowest configured intensity used" : "")}";
    }

    private async Task AskAndRunAsync(string title, string prompt, string confirmText, Color color, Func<string, EngineCommand> command)
    {
        var parameters = new DialogParameters<ReasonDialog>
        {
            { d => d.Prompt, prompt },
            { d => d.ConfirmText, confirmText },
            { d => d.ConfirmColor, color },
        };
        var dialog = await Dialogs.ShowAsync<ReasonDialog>(title, parameters, new DialogOptions { MaxWidth = MaxWidth.Small, FullWidth = true, CloseOnEscapeKey = true });
        var result = await dialog.Result;
        if (result is null || result.Canceled || result.Data is not string reason || string.IsNullOrWhiteSpace(reason))
        {
            return;
        }
        CommandOutcome outcome;
        try
        {
            outcome = await Commands.ExecuteAsync(_caller, command(reason));
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            outcome = new CommandOutcome(CommandOutcomeKind.Failed, $"Not sent: {ex.Message}");
        }
        Snackbar.Add(outcome.Message, outcome.Kind switch
        {
            CommandOutcomeKind.Applied => Severity.Success,
            CommandOutcomeKind.Refused => Severity.Warning,
            _ => Severity.Error,
        });
    }

    private static string Name(Phase phase) => LvpVocabulary.For(phase).Name;
}
