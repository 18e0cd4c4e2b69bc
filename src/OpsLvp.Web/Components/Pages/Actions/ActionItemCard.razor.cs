using Microsoft.AspNetCore.Components;
using MudBlazor;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>
/// One checklist item on a tablet. A tap asks for confirmation (optional note); the tick is sent through the
/// command service and the card shows "sending…" until the outcome and then the next snapshot say what is true:
/// it never shows an item done that the server has not committed. Undo needs a reason.
/// </summary>
public partial class ActionItemCard
{
    private TickStage _stage = TickStage.Idle;
    private string? _note;
    private string? _reason;
    private string? _message;
    private Severity _messageSeverity = Severity.Info;
    private long? _waitBeyondVersion;
    private ItemStatus _wanted;

    [Inject]
    private ILvpCommandService Commands { get; set; } = default!;

    /// <summary>The item as the latest snapshot shows it.</summary>
    [Parameter, EditorRequired]
    public ChecklistItemView Item { get; set; } = default!;

    /// <summary>Who is using the tablet.</summary>
    [Parameter, EditorRequired]
    public CommandCaller Caller { get; set; } = CommandCaller.Anonymous;

    /// <summary>The snapshot's version: a sent command resolves once a newer snapshot arrives.</summary>
    [Parameter]
    public long SnapshotVersion { get; set; }

    /// <summary>The snapshot's instant, for "due in" and "overdue by".</summary>
    [Parameter]
    public DateTimeOffset Now { get; set; }

    /// <summary>Raised when the person starts acting on this card (tick, undo, not applicable) and when it is sent: the page holds its order (<see cref="TabletCards"/>).</summary>
    [Parameter]
    public EventCallback Touched { get; set; }

    /// <summary>
    /// "NOT RECORDING since 03:12:05Z" while the server cannot record (<see cref="Shared.RecordingBanner.NotRecordingText"/>),
    /// else null. The card then offers no tick, undo or not-applicable that looks as if it would be applied: each such
    /// button is disabled and the card says why (docs/reliability.md "Storage faults"). A confirmation already open stays
    /// answerable; the server refuses what it sends, and the card shows the refusal and its reason.
    /// </summary>
    [Parameter]
    public string? NotRecording { get; set; }

    internal TickStage Stage => _stage;

    private string NotRecordingNote => $"{NotRecording}: a tick, undo or not-applicable cannot be recorded now and would be refused. Do the work; record it here when recording resumes.";

    private string PhaseLabel => LvpVocabulary.For(Item.Phase).Name;

    private string StatusAttribute => _stage == TickStage.Sending ? "sending" : Item.Status.ToString().ToLowerInvariant();

    private string CardClass => Item switch
    {
        { Status: ItemStatus.Done or ItemStatus.NotApplicable } => "done",
        { Overdue: true } => "overdue",
        _ => "open",
    };

    private string DueText => Item switch
    {
        { Status: ItemStatus.Done or ItemStatus.NotApplicable } => $"was due {DisplayFormat.UtcClock(Item.DueAt)}",
        { Overdue: true } => $"OVERDUE by {DisplayFormat.Duration(Now - Item.DueAt)} — was due {DisplayFormat.UtcClock(Item.DueAt)}",
        _ => $"due {DisplayFormat.UtcClock(Item.DueAt)} (in {DisplayFormat.Duration(Item.DueAt - Now)})",
    };

    protected override void OnParametersSet()
    {
        // Someone else ticked (or undid) while this tablet was asking: the question no longer applies.
        if (_stage == TickStage.Confirming && Item.Status == ItemStatus.Done && Item.Tick is { } tick)
        {
            _stage = TickStage.Idle;
            _message = $"Already done by {tick.User} at {DisplayFormat.UtcClockSeconds(tick.At)}";
            _messageSeverity = Severity.Info;
        }
        else if ((_stage == TickStage.UndoReason && Item.Status is not (ItemStatus.Done or ItemStatus.NotApplicable))
            || (_stage is TickStage.Confirming or TickStage.NotApplicableReason && Item.Status != ItemStatus.Open))
        {
            _stage = TickStage.Idle;
        }
        // A sent command is settled by the server's state: the item reached the wanted status, or a newer snapshot came.
        if (_stage == TickStage.Sending && _waitBeyondVersion is { } v && (Item.Status == _wanted || SnapshotVersion > v))
        {
            _stage = TickStage.Idle;
            _waitBeyondVersion = null;
        }
    }

    private Task AskConfirm()
    {
        _message = null;
        _note = null;
        _stage = TickStage.Confirming;
        return Touched.InvokeAsync();
    }

    private Task AskUndo()
    {
        _message = null;
        _reason = null;
        _stage = TickStage.UndoReason;
        return Touched.InvokeAsync();
    }

    private Task AskNotApplicable()
    {
        _message = null;
        _reason = null;
        _stage = TickStage.NotApplicableReason;
        return Touched.InvokeAsync();
    }

    private void Back() => _stage = TickStage.Idle;

    private Task NotApplicableAsync() =>
        string.IsNullOrWhiteSpace(_reason) ? Task.CompletedTask : SendAsync(new MarkNotApplicable(Caller.Name, Item.ItemId, _reason.Trim()), ItemStatus.NotApplicable);

    private Task TickAsync() =>
        SendAsync(new TickItem(Caller.Name, Item.Team, Item.ItemId, string.IsNullOrWhiteSpace(_note) ? null : _note.Trim()), ItemStatus.Done);

    private Task UndoAsync() =>
        string.IsNullOrWhiteSpace(_reason) ? Task.CompletedTask : SendAsync(new UntickItem(Caller.Name, Item.ItemId, _reason.Trim()), ItemStatus.Open);

    private async Task SendAsync(EngineCommand command, ItemStatus wanted)
    {
        _stage = TickStage.Sending;
        await Touched.InvokeAsync();
        _wanted = wanted;
        _waitBeyondVersion = null;
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
        if (outcome.Applied)
        {
            if (Item.Status == wanted)
            {
                _stage = TickStage.Idle;
            }
            else
            {
                _waitBeyondVersion = SnapshotVersion;
            }
            return;
        }
        _stage = TickStage.Idle;
        _message = outcome.Message;
        _messageSeverity = outcome.Kind == CommandOutcomeKind.Failed ? Severity.Error : Severity.Warning;
    }
}
