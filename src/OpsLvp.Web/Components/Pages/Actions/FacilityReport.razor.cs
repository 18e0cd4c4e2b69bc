using Microsoft.AspNetCore.Components;
using MudBlazor;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>
/// A team reports a fault on a facility it owns from its tablet (docs/capability.md, docs/engine.md R30): tap the
/// facility, tap its status, give a reason, send. Only the caller's teams' facilities are offered; the report goes
/// through the command service as <see cref="SetFacilityStatus"/> with the owning team, which checks the team again.
/// </summary>
public partial class FacilityReport
{
    private IReadOnlyList<FacilityConfig> _own = [];
    private string? _selectedId;
    private FacilityStatus? _status;
    private string? _reason;
    private bool _sending;
    private string? _message;
    private Severity _messageSeverity = Severity.Info;

    [Inject]
    private ILvpCommandService Commands { get; set; } = default!;

    /// <summary>The engine's view: the profile's facilities and their reported statuses.</summary>
    [Parameter, EditorRequired]
    public EngineStatus Status { get; set; } = default!;

    /// <summary>Who is using the tablet.</summary>
    [Parameter, EditorRequired]
    public CommandCaller Caller { get; set; } = CommandCaller.Anonymous;

    private FacilityConfig? Selected => _selectedId is null ? null : _own.FirstOrDefault(f => f.Id == _selectedId);

    protected override void OnParametersSet()
    {
        _own = Status.FacilityConfigs.Where(f => f.Team is not null && Caller.Teams.Contains(f.Team)).ToList();
        if (_selectedId is not null && Selected is null)
        {
            Back();
        }
    }

    private void Pick(FacilityConfig facility)
    {
        _selectedId = facility.Id;
        _status = null;
        _reason = null;
        _message = null;
    }

    private void Choose(FacilityStatus status) => _status = status;

    private void Back()
    {
        _selectedId = null;
        _status = null;
        _reason = null;
    }

    private async Task SendAsync()
    {
        if (Selected is not { } facility || _status is not { } status || string.IsNullOrWhiteSpace(_reason))
        {
            return;
        }
        var command = new SetFacilityStatus(Caller.Name, facility.Id, status, _reason.Trim(), facility.Team);
        _sending = true;
        _message = null;
        CommandOutcome outcome;
        try
        {
            outcome = await Commands.ExecuteAsync(Caller, command);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            outcome = new CommandOutcome(CommandOutcomeKind.Failed, $"Not sent: {ex.Message}");
        }
        _sending = false;
        if (outcome.Applied)
        {
            _message = $"Reported: {facility.Name} {CapabilityWords.Status(status)}";
            _messageSeverity = Severity.Success;
            Back();
        }
        else
        {
            _message = outcome.Message;
            _messageSeverity = outcome.Kind == CommandOutcomeKind.Refused ? Severity.Warning : Severity.Error;
        }
    }
}
