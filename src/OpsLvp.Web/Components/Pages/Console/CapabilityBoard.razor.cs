using Microsoft.AspNetCore.Components;
using MudBlazor;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>Facility status board, runway in use and observer RVR entry of the duty console (docs/capability.md, docs/engine.md R30, R34, R35).</summary>
public partial class CapabilityBoard
{
    private string? _obsDirection;
    private RvrPosition _obsPosition = RvrPosition.Tdz;
    private double? _obsMetres;
    private string? _obsName;

    [Parameter, EditorRequired]
    public EngineStatus Status { get; set; } = default!;

    [Parameter, EditorRequired]
    public CommandCaller Caller { get; set; } = CommandCaller.Anonymous;

    [Parameter]
    public bool IsDutyManager { get; set; }

    [Inject]
    private ILvpCommandService Commands { get; set; } = default!;

    [Inject]
    private IDialogService Dialogs { get; set; } = default!;

    [Inject]
    private ISnackbar Snackbar { get; set; } = default!;

    /// <summary>"serviceable", or "unserviceable: reason (by who at 22:30Z)".</summary>
    internal static string StatusText(FacilityState? state) =>
        state is null ? CapabilityWords.Status(FacilityStatus.Serviceable) : $"{CapabilityWords.Status(state.Status)}: {state.Reason} ({state.By} at {DisplayFormat.UtcClock(state.Since)})";

    private static string Cap(string s) => s.Length == 0 ? s : char.ToUpperInvariant(s[0]) + s[1..];

    private Task SetFacilityAsync(FacilityConfig facility, FacilityStatus status) =>
        AskAndRunAsync($"{facility.Name}: {CapabilityWords.Status(status)}",
            $"Report {facility.Name} {CapabilityWords.Status(status)}. Runway capability is recomputed at once; the report is audited.",
            Cap(CapabilityWords.Status(status)),
            reason => new SetFacilityStatus(Caller.Name, facility.Id, status, reason));

    /// <summary>The runway's directions from the profile (a runway id is a name; it is never split).</summary>
    private IReadOnlyList<string> Directions(string runway) =>
        Status.RunwayDirections.TryGetValue(runway, out var directions) ? directions : [];

    private Task SetRunwayAsync(string runway, string direction) =>
        AskAndRunAsync($"Runway {runway}: {direction} in use",
            $"Make {direction} the direction in use of runway {runway}: RVR positions and capability follow at once.",
            $"Use {direction}",
            reason => new SetRunwayInUse(Caller.Name, runway, direction, reason));

    private async Task EnterObserverAsync()
    {
        if (string.IsNullOrWhiteSpace(_obsDirection) || string.IsNullOrWhiteSpace(_obsName) || _obsMetres is not { } metres)
        {
            return;
        }
        await RunAsync(new EnterObserverRvr(Caller.Name, _obsDirection.Trim(), _obsPosition, metres, _obsName.Trim()));
    }

    private async Task AskAndRunAsync(string title, string prompt, string confirmText, Func<string, EngineCommand> command)
    {
        var parameters = new DialogParameters<ReasonDialog>
        {
            { d => d.Prompt, prompt },
            { d => d.ConfirmText, confirmText },
            { d => d.ConfirmColor, Color.Primary },
        };
        var dialog = await Dialogs.ShowAsync<ReasonDialog>(title, parameters, new DialogOptions { MaxWidth = MaxWidth.Small, FullWidth = true, CloseOnEscapeKey = true });
        var result = await dialog.Result;
        if (result is null || result.Canceled || result.Data is not string reason || string.IsNullOrWhiteSpace(reason))
        {
            return;
        }
        await RunAsync(command(reason));
    }

    private async Task RunAsync(EngineCommand command)
    {
        CommandOutcome outcome;
        try
        {
            outcome = await Commands.ExecuteAsync(Caller, command);
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
}
