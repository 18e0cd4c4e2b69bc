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
/// declare/cancel/hold/forecast/light-step/sensor actions (each asking a reason in a dialog that says, from the
/// engine's own preview, what the command would do) and each team's progress on the current phase. Everything shown
/// comes from <see cref="ConsoleViewModel"/>; every command's outcome is told through <see cref="CommandFeedback"/>.
/// </summary>
public partial class DutyConsole : LiveComponentBase
{
    /// <summary>The reason the preview is evaluated with: the engine asks for one; nothing is recorded.</summary>
    private const string PreviewReason = "(preview)";

    private CommandCaller _caller = CommandCaller.Anonymous;
    private LiveSnapshot? _snapshot;
    private ConsoleViewModel? _view;

    [Inject]
    private ILvpCommandService Commands { get; set; } = default!;

    [Inject]
    private ICommandPreview Previews { get; set; } = default!;

    [Inject]
    private IDialogService Dialogs { get; set; } = default!;

    [Inject]
    private ISnackbar Snackbar { get; set; } = default!;

    /// <summary>The server's clock: ages and times-in-phase count from it, never from the engine's last evaluation.</summary>
    [Inject]
    private TimeProvider Clock { get; set; } = default!;

    [CascadingParameter]
    private Task<AuthenticationState>? AuthenticationState { get; set; }

    protected override async Task OnInitializedAsync()
    {
        if (AuthenticationState is not null)
        {
            _caller = CommandCaller.FromPrincipal((await AuthenticationState).User);
        }
        ShowSnapshot(Live.Current);
    }

    protected override void OnSnapshot(LiveSnapshot snapshot)
    {
        _snapshot = snapshot;
        _view = ConsoleViewModel.Build(snapshot, Clock.GetUtcNow(), _caller);
    }

    private Task ConfirmPendingAsync()
    {
        if (_snapshot?.Status.Pending is not { } p)
        {
            return Task.CompletedTask;
        }
        var what = LvpVocabulary.Change(p.From, p.To);
        return AskAndRunAsync(new ConsoleAsk($"Confirm {what}", $"Confirm the pending transition {what} ({p.Reason}).", $"Confirm {Name(p.To)}", Color.Warning,
            reason => new ConfirmPending(_caller.Name, reason))
        {
            // the proposal may be withdrawn (or replaced) while the reason is typed: never confirm another one
            StillValid = () => _snapshot?.Status.Pending is { } now && now.From == p.From && now.To == p.To && now.ConditionMetAt == p.ConditionMetAt
                ? null
                : $"not sent: the proposal {what} was withdrawn while the reason was typed; nothing was confirmed",
        });
    }

    private Task DeclareAsync(Phase phase) =>
        AskAndRunAsync(new ConsoleAsk($"Declare {Name(phase)}",
            $"Declare {Name(phase)} now. This sets a hold: the phase will not relax automatically below {Name(phase)} until the hold is released.",
            $"Declare {Name(phase)}", phase == Phase.Active ? Color.Error : Color.Warning,
            reason => new DeclarePhase(_caller.Name, phase, reason)));

    private Task DeclareOverrideAsync() =>
        AskAndRunAsync(new ConsoleAsk($"Declare {Name(Phase.Active)} over open safeguards",
            $"Declare {Name(Phase.Active)} although mandatory preparation items are open. The override and its reason are audited and shown on every screen until the phase leaves active.",
            "Declare anyway", Color.Error,
            reason => new DeclarePhase(_caller.Name, Phase.Active, reason, reason)));

    private Task NotApplicableAsync(ConsoleSafeguard item) =>
        AskAndRunAsync(new ConsoleAsk($"Mark \"{item.Text}\" not applicable",
            $"Mark the safeguard \"{item.Text}\" ({item.ItemId}) not applicable. It then counts as done (docs/engine.md R13); the reason is audited.",
            "Not applicable", Color.Warning,
            reason => new MarkNotApplicable(_caller.Name, item.ItemId, reason)));

    private Task CancelAsync() =>
        AskAndRunAsync(new ConsoleAsk("Cancel LVP",
            "Cancel: LVP in force goes to cancelling LVP, preparation goes to normal operations, even against the conditions.", "Cancel LVP", Color.Info,
            reason => new CancelLvp(_caller.Name, reason))
        {
            ShowConditions = true,
            SecondConfirmText = "Cancel LVP against the conditions",
        });

    private Task ReleaseHoldAsync() =>
        AskAndRunAsync(new ConsoleAsk("Release hold", "Release the declared hold: automatic relaxation may follow at once if its dwell has held.", "Release hold", Color.Primary,
            reason => new ReleaseHold(_caller.Name, reason)));

    private Task ToggleForecastAsync()
    {
        var on = !(_snapshot?.Status.DeteriorationForecast ?? false);
        return AskAndRunAsync(new ConsoleAsk(on ? "Set deterioration forecast" : "Clear deterioration forecast",
            on ? "Set the deterioration forecast flag." : "Clear the deterioration forecast flag.",
            on ? "Set forecast" : "Clear forecast", Color.Primary,
            reason => new SetForecast(_caller.Name, on, reason)));
    }

    private Task SetSensorAsync(ConsoleSensor sensor) =>
        AskAndRunAsync(new ConsoleAsk(sensor.OutOfService ? $"Return {sensor.SensorId} to service" : $"Take {sensor.SensorId} out of service",
            sensor.OutOfService ? $"Mark {sensor.SensorId} back in service: its readings count again." : $"Mark {sensor.SensorId} out of service: its readings no longer count.",
            sensor.OutOfService ? "Back in service" : "Out of service", Color.Primary,
            reason => new SetSensorService(_caller.Name, sensor.SensorId, sensor.OutOfService, reason)));

    private Task SetLightStepAsync(int step) =>
        AskAndRunAsync(new ConsoleAsk($"Set runway-light step {step}",
            step == 0
                ? "Record that the runway lights are off (step 0): RVR is then the object range alone (MOR). The setting is audited and stands until a newer lighting-sensor reading."
                : $"Record that the runway lights are at step {step}: RVR uses its intensity. The setting is audited and stands until a newer lighting-sensor reading.",
            $"Set step {step}", Color.Primary,
            reason => new SetLightStep(_caller.Name, step, reason)));

    /// <summary>"3 (set by kim at 06:10Z)": see <see cref="ConsoleViewModel.LightStepLine"/>.</summary>
    internal static string LightStepText(OpsLvp.Core.Optics.LightStepInUse? use) => ConsoleViewModel.LightStepLine(use);

    /// <summary>
    /// Every console command goes through here: the dialog (with the engine's preview of the command: what it acts
    /// against, whether it moves the state, a second ask when a cancel goes against the conditions), the page's own
    /// last check, the command service, and the outcome told through <see cref="CommandFeedback"/>.
    /// </summary>
    private async Task AskAndRunAsync(ConsoleAsk ask)
    {
        var preview = PreviewOf(ask.Command(PreviewReason));
        var parameters = new DialogParameters<ReasonDialog>
        {
            { d => d.Prompt, ask.Prompt },
            { d => d.ConfirmText, ask.ConfirmText },
            { d => d.ConfirmColor, ask.Color },
            { d => d.Effect, preview is null ? "What this would do cannot be told now: the engine has no state yet." : CommandPreviewWords.Effect(preview) },
        };
        if (ask.ShowConditions && preview is not null)
        {
            parameters.Add(d => d.Facts, CommandPreviewWords.ConditionFacts(preview));
            parameters.Add(d => d.Verdict, CommandPreviewWords.CancelVerdict(preview));
            if (CommandPreviewWords.SecondAsk(preview) is { } second)
            {
                parameters.Add(d => d.SecondAsk, second);
                parameters.Add(d => d.SecondConfirmText, ask.SecondConfirmText);
            }
        }
        var dialog = await Dialogs.ShowAsync<ReasonDialog>(ask.Title, parameters, new DialogOptions { MaxWidth = MaxWidth.Small, FullWidth = true, CloseOnEscapeKey = true });
        var result = await dialog.Result;
        if (result is null || result.Canceled || result.Data is not string reason || string.IsNullOrWhiteSpace(reason))
        {
            return;
        }
        CommandOutcome outcome;
        if (ask.StillValid?.Invoke() is { } stale)
        {
            outcome = new CommandOutcome(CommandOutcomeKind.Refused, stale);
        }
        else
        {
            try
            {
                outcome = await Commands.ExecuteAsync(_caller, ask.Command(reason));
            }
            catch (Exception ex) when (ex is not OperationCanceledException)
            {
                outcome = new CommandOutcome(CommandOutcomeKind.Failed, $"not sent: {ex.Message}");
            }
        }
        CommandFeedback.Show(Snackbar, ask.Title, outcome);
    }

    private CommandPreview? PreviewOf(EngineCommand command)
    {
        try
        {
            return Previews.Preview(command);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            // a preview that cannot be computed must not stop the command: the dialog says it cannot tell
            return null;
        }
    }

    private static string Name(Phase phase) => LvpVocabulary.For(phase).Name;
}
