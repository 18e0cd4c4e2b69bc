using Microsoft.AspNetCore.Components;
using Microsoft.AspNetCore.Components.Authorization;
using MudBlazor;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Access;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Shared;

/// <summary>
/// Raised alarms from <see cref="LiveSnapshot.Status"/>: unacknowledged first, an acknowledge button for duty
/// managers (the command service decides), and on screens that ask for it (<see cref="Audible"/>) the
/// <see cref="AlarmCue"/>: a chime for every newly raised unacknowledged alarm, mutable per screen.
/// Renders nothing and subscribes to nothing for a visitor who may not see live data
/// (<see cref="AccessPolicies.MayViewLiveData"/>): the layout is shared with the anonymous pages.
/// </summary>
public partial class AlarmStrip
{
    private readonly HashSet<string> _sending = new(StringComparer.Ordinal);
    private readonly HashSet<string> _shownInFull = new(StringComparer.Ordinal);
    private ILiveState? _live;
    private ILvpCommandService? _commands;
    private IReadOnlyList<Alarm> _alarms = [];
    private PendingTransition? _pending;
    private IDisposable? _subscription;
    private CommandCaller _caller = CommandCaller.Anonymous;
    private bool _mayView;

    [Inject]
    private IServiceProvider Services { get; set; } = default!;

    [Inject]
    private ISnackbar Snackbar { get; set; } = default!;

    [CascadingParameter]
    private Task<AuthenticationState>? AuthenticationState { get; set; }

    /// <summary>Chime for new unacknowledged alarms (the wall). Off by default.</summary>
    [Parameter]
    public bool Audible { get; set; }

    /// <summary>Names the screen whose mute choice is remembered (localStorage).</summary>
    [Parameter]
    public string ScreenKey { get; set; } = "default";

    /// <summary>Extra CSS class, e.g. to make the strip larger on the wall.</summary>
    [Parameter]
    public string? Class { get; set; }

    /// <summary>Unacknowledged alarms shown right now.</summary>
    internal int UnacknowledgedCount => _alarms.Count(a => !a.Acknowledged);

    private bool CanAcknowledge => _commands is not null && _caller.IsInRole(Roles.DutyManager);

    private string StripClass => $"{(UnacknowledgedCount > 0 ? "has-unacked" : "")} {Class}".Trim();

    protected override async Task OnInitializedAsync()
    {
        if (AuthenticationState is not null)
        {
            var user = (await AuthenticationState).User;
            _mayView = AccessPolicies.MayViewLiveData(user);
            _caller = CommandCaller.FromPrincipal(user);
        }
        if (!_mayView)
        {
            return;
        }
        _live = Services.GetService<ILiveState>();
        _commands = Services.GetService<ILvpCommandService>();
        _alarms = AlarmLabels.Ordered(_live?.Current?.Status.Alarms);
        _pending = _live?.Current?.Status.Pending;
    }

    protected override void OnAfterRender(bool firstRender)
    {
        if (!firstRender || !_mayView)
        {
            return;
        }
        if (_live is not null)
        {
            _subscription = _live.Subscribe(OnSnapshotAsync);
            if (_live.Current is { } current)
            {
                Show(current);
            }
        }
        StateHasChanged();
    }

    private Task OnSnapshotAsync(LiveSnapshot snapshot) => InvokeAsync(() =>
    {
        Show(snapshot);
        StateHasChanged();
    });

    private void Show(LiveSnapshot snapshot)
    {
        _alarms = AlarmLabels.Ordered(snapshot.Status.Alarms);
        _pending = snapshot.Status.Pending;
    }

    private string Message(Alarm alarm) => AlarmWords.Message(alarm, _pending);

    /// <summary>
    /// Longer than two lines on a narrow screen: shown cut to its first lines (three on a phone) with "Show all", so a
    /// long alarm (a database error in full) does not push the page's phase or the next alarm out of view.
    /// </summary>
    internal const int LongMessageChars = 110;

    private bool IsLong(Alarm alarm) => Message(alarm).Length > LongMessageChars;

    private bool IsCut(Alarm alarm) => IsLong(alarm) && !_shownInFull.Contains(AlarmLabels.Identity(alarm));

    private void ToggleFull(Alarm alarm)
    {
        if (!_shownInFull.Remove(AlarmLabels.Identity(alarm)))
        {
            _shownInFull.Add(AlarmLabels.Identity(alarm));
        }
    }

    /// <summary>"3 alarms · 2 unacknowledged": the strip's count line, so a flood reads at a glance.</summary>
    internal string CountText => _alarms.Count == 1
        ? (UnacknowledgedCount == 1 ? "1 alarm · unacknowledged" : "1 alarm · acknowledged")
        : $"{_alarms.Count} alarms · {UnacknowledgedCount} unacknowledged";

    private async Task AcknowledgeAsync(Alarm alarm)
    {
        if (_commands is null || !_sending.Add(alarm.Key))
        {
            return;
        }
        try
        {
            var outcome = await _commands.ExecuteAsync(_caller, new AcknowledgeAlarm(_caller.Name, alarm.Key));
            if (!outcome.Applied)
            {
                Snackbar.Add(outcome.Message, outcome.Kind == CommandOutcomeKind.Failed ? Severity.Error : Severity.Warning);
            }
        }
        finally
        {
            _sending.Remove(alarm.Key);
        }
    }

    public ValueTask DisposeAsync()
    {
        _subscription?.Dispose();
        GC.SuppressFinalize(this);
        return ValueTask.CompletedTask;
    }
}
