using Microsoft.AspNetCore.Components;
using Microsoft.AspNetCore.Components.Authorization;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Shared;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>
/// The tablet page: the signed-in person's teams' items for the running episode, overdue first. Live data from
/// <see cref="ILiveState"/>; ticks go through the command service from <see cref="ActionItemCard"/>.
/// </summary>
public partial class TabletActions : LiveComponentBase
{
    private CommandCaller _caller = CommandCaller.Anonymous;
    private LiveSnapshot? _snapshot;
    private IReadOnlyList<ChecklistItemView> _items = [];

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
        if (AuthenticationState is not null)
        {
            _caller = CommandCaller.FromPrincipal((await AuthenticationState).User);
        }
        ShowSnapshot(Live.Current);
    }

    protected override void OnSnapshot(LiveSnapshot snapshot)
    {
        _snapshot = snapshot;
        _items = ActionList.For(snapshot.Items, _caller.Teams);
    }

    /// <summary>The state's name from the one vocabulary, in capitals as on the wall and the console.</summary>
    internal static string PhaseText(LiveSnapshot s) => LvpVocabulary.For(s.Status).Headline;

    private static string PhaseClass(LiveSnapshot s) => "phase-" + LvpVocabulary.For(s.Status).Tone.ToString().ToLowerInvariant();
}
