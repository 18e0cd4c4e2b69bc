using Microsoft.AspNetCore.Components;
using Microsoft.AspNetCore.Components.Authorization;
using Microsoft.JSInterop;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Shared;
using OpsLvp.Web.Components.Shell;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>
/// The tablet page: the signed-in person's teams' items for the running episode, overdue first. Live data from
/// <see cref="ILiveState"/>; ticks go through the command service from <see cref="ActionItemCard"/>. Cards do not
/// move under a finger and done items of earlier phases fold away (<see cref="TabletCards"/>).
/// </summary>
public partial class TabletActions : LiveComponentBase, IAsyncDisposable
{
    private TabletCards _cards = new();
    private CommandCaller _caller = CommandCaller.Anonymous;
    private LiveSnapshot? _snapshot;
    private IReadOnlyList<ChecklistItemView> _items = [];
    private ITimer? _holdTimer;
    private DotNetObjectReference<TabletActions>? _self;
    private IJSObjectReference? _scrollWatch;

    [Inject]
    private IServiceProvider ServiceProvider { get; set; } = default!;

    [Inject]
    private IJSRuntime JS { get; set; } = default!;

    /// <summary>Real time for the hold (a person's few seconds do not speed up with the demo clock).</summary>
    private TimeProvider RealClock =>
        ServiceProvider.GetKeyedService<TimeProvider>(TimeServiceCollectionExtensions.NetworkClockKey) ?? TimeProvider.System;

    [CascadingParameter]
    private Task<AuthenticationState>? AuthenticationState { get; set; }

    private string TeamNames
    {
        get
        {
            var names = _caller.Teams
                .Select(t => _snapshot?.Items.FirstOrDefault(i => i.Team == t)?.TeamName ?? t)
                .Order(StringComparer.Ordinal);
            return string.Join(", ", names);
        }
    }

    /// <summary>The profile's idle time in seconds (10 min until the first snapshot names it).</summary>
    private int IdleSeconds => (_snapshot?.Aerodrome.TabletIdleSignOutMinutes ?? 10) * 60;

    protected override async Task OnInitializedAsync()
    {
        _cards = new TabletCards(ServiceProvider.GetService<Microsoft.Extensions.Options.IOptions<ScreenOptions>>()?.Value.TabletCardHold);
        if (AuthenticationState is not null)
        {
            _caller = CommandCaller.FromPrincipal((await AuthenticationState).User);
        }
        ShowSnapshot(Live.Current);
    }

    /// <summary>"NOT RECORDING since …" while the server cannot record, for the cards; null while it records.</summary>
    private string? NotRecordingText => Shared.RecordingBanner.NotRecordingText(_snapshot?.Recording);

    protected override void OnSnapshot(LiveSnapshot snapshot)
    {
        _snapshot = snapshot;
        _items = ActionList.For(snapshot.Items, _caller.Teams);
        _cards.Show(_items, snapshot.Status.Phase, RealClock.GetUtcNow());
    }

    protected override async Task OnAfterRenderAsync(bool firstRender)
    {
        if (firstRender && _caller.Authenticated)
        {
            try
            {
                _self = DotNetObjectReference.Create(this);
                var module = await JS.InvokeAsync<IJSObjectReference>("import", "./assets/tablet-hold.js");
                _scrollWatch = await module.InvokeAsync<IJSObjectReference>("watch", _self);
            }
            catch (Exception ex) when (ex is JSException or JSDisconnectedException or InvalidOperationException or TaskCanceledException)
            {
                // without the scroll watch the hold still ends after TabletCards.HoldFor
            }
        }
    }

    /// <summary>A finger on a card: keep every card in place until a scroll or <see cref="TabletCards.HoldFor"/> after the last touch.</summary>
    private void OnCardTouched()
    {
        _cards.Hold(RealClock.GetUtcNow());
        _holdTimer?.Dispose();
        _holdTimer = RealClock.CreateTimer(_ => _ = InvokeAsync(HoldTimeUp), null, _cards.HoldFor, Timeout.InfiniteTimeSpan);
    }

    private void HoldTimeUp()
    {
        if (_cards.Release(RealClock.GetUtcNow()))
        {
            StateHasChanged();
        }
    }

    /// <summary>The page was scrolled (tablet-hold.js): the person has moved on, so the cards may be sorted again.</summary>
    [JSInvokable]
    public Task Scrolled() => InvokeAsync(() =>
    {
        if (_cards.Release())
        {
            StateHasChanged();
        }
    });

    async ValueTask IAsyncDisposable.DisposeAsync()
    {
        _holdTimer?.Dispose();
        if (_scrollWatch is not null)
        {
            try
            {
                await _scrollWatch.InvokeVoidAsync("stop");
                await _scrollWatch.DisposeAsync();
            }
            catch (Exception ex) when (ex is JSException or JSDisconnectedException or TaskCanceledException)
            {
            }
        }
        _self?.Dispose();
        // the renderer may call only this one of the two: unsubscribe from the live state too
        Dispose();
    }

    /// <summary>The state's name from the one vocabulary, in capitals as on the wall and the console.</summary>
    internal static string PhaseText(LiveSnapshot s) => LvpVocabulary.For(s.Status).Headline;

    private static string PhaseClass(LiveSnapshot s) => "phase-" + LvpVocabulary.For(s.Status).Tone.ToString().ToLowerInvariant();
}
