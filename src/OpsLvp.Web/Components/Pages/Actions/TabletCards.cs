using OpsLvp.Core.Engine;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>
/// The tablet's cards in an order that does not move under a finger (issue 13; docs/screens.md "Tablet"). The order
/// is <see cref="ActionList.For"/>'s (overdue, open by due time, done), except while held: from the moment a person
/// touches a card (asks to tick, undo or mark not applicable, or sends it) until they scroll the page or
/// <see cref="HoldFor"/> passes after their last touch, every card keeps its place and its section; cards that
/// appear meanwhile go to the end, cards that are gone leave. When the hold ends the cards are sorted again and done
/// items of phases before the current one fold into the collapsed "done earlier" section.
/// Times are real (wall-clock) times, not the demo clock: a person's few seconds do not speed up.
/// </summary>
public sealed class TabletCards
{
    /// <summary>The default hold (<c>Screens:TabletCardHold</c>): long enough to see the card turn done, short enough that the list is sorted before the next item is looked for (OpsLvp's choice).</summary>
    public static readonly TimeSpan DefaultHold = TimeSpan.FromSeconds(5);

    private List<ChecklistItemView> _cards = [];
    private List<ChecklistItemView> _folded = [];
    private List<ChecklistItemView> _latest = [];
    private Phase _phase = Phase.Normal;

    /// <param name="holdFor">How long cards stay in place after the last touch without a scroll; <see cref="DefaultHold"/> when null.</param>
    public TabletCards(TimeSpan? holdFor = null)
    {
        HoldFor = holdFor ?? DefaultHold;
    }

    /// <summary>How long cards stay in place after the last touch when nobody scrolls.</summary>
    public TimeSpan HoldFor { get; }

    /// <summary>The cards shown in the main grid, in display order.</summary>
    public IReadOnlyList<ChecklistItemView> Cards => _cards;

    /// <summary>Done (or not applicable) items of phases before the current one, in the collapsed section.</summary>
    public IReadOnlyList<ChecklistItemView> Folded => _folded;

    /// <summary>Every item shown, in either section (for counts).</summary>
    public IEnumerable<ChecklistItemView> All => _cards.Concat(_folded);

    /// <summary>When the current hold ends by itself (real time); null when not held.</summary>
    public DateTimeOffset? HeldUntil { get; private set; }

    /// <summary>The key that identifies one card across snapshots: the item and the instance (an item re-opened in a later episode is another card).</summary>
    public static string Key(ChecklistItemView item)
    {
        ArgumentNullException.ThrowIfNull(item);
        return $"{item.ItemId}@{item.OpenedAt.UtcTicks}";
    }

    /// <summary>Takes the items of a new snapshot (already filtered and sorted by <see cref="ActionList.For"/>) at real time <paramref name="realNow"/>.</summary>
    public void Show(IReadOnlyList<ChecklistItemView> sorted, Phase phase, DateTimeOffset realNow)
    {
        ArgumentNullException.ThrowIfNull(sorted);
        _latest = [.. sorted];
        _phase = phase;
        if (HeldUntil is { } until && realNow >= until)
        {
            HeldUntil = null;
        }
        if (HeldUntil is null)
        {
            Arrange();
            return;
        }
        // held: same places and sections, fresher item states; new cards at the end of the grid
        var byKey = _latest.ToDictionary(Key, StringComparer.Ordinal);
        var placed = new HashSet<string>(StringComparer.Ordinal);
        List<ChecklistItemView> Keep(List<ChecklistItemView> section)
        {
            var kept = new List<ChecklistItemView>(section.Count);
            foreach (var old in section)
            {
                if (byKey.TryGetValue(Key(old), out var now) && placed.Add(Key(now)))
                {
                    kept.Add(now);
                }
            }
            return kept;
        }
        _cards = Keep(_cards);
        _folded = Keep(_folded);
        _cards.AddRange(_latest.Where(i => !placed.Contains(Key(i))));
    }

    /// <summary>A finger on a card: hold the order until <see cref="HoldFor"/> after <paramref name="realNow"/> or a scroll.</summary>
    public void Hold(DateTimeOffset realNow) => HeldUntil = realNow + HoldFor;

    /// <summary>The person scrolled, or the hold time is up at <paramref name="realNow"/>: sort and fold again. True when anything moved.</summary>
    public bool Release(DateTimeOffset? realNow = null)
    {
        if (HeldUntil is null || (realNow is { } now && now < HeldUntil))
        {
            return false;
        }
        HeldUntil = null;
        var before = _cards.Select(Key).Concat(["|"]).Concat(_folded.Select(Key)).ToList();
        Arrange();
        return !before.SequenceEqual(_cards.Select(Key).Concat(["|"]).Concat(_folded.Select(Key)), StringComparer.Ordinal);
    }

    /// <summary>True for a done or not-applicable item of a phase before <paramref name="current"/>.</summary>
    public static bool FoldsAway(ChecklistItemView item, Phase current)
    {
        ArgumentNullException.ThrowIfNull(item);
        return item.Status is ItemStatus.Done or ItemStatus.NotApplicable && Rank(item.Phase) < Rank(current);
    }

    private void Arrange()
    {
        _cards = [.. _latest.Where(i => !FoldsAway(i, _phase))];
        _folded = [.. _latest.Where(i => FoldsAway(i, _phase))];
    }

    /// <summary>The phases in the order an episode goes through them.</summary>
    private static int Rank(Phase phase) => phase switch
    {
        Phase.Normal => 0,
        Phase.Preparation => 1,
        Phase.Active => 2,
        Phase.Cancellation => 3,
        _ => 4,
    };
}
