using System.Collections.Immutable;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    private sealed partial class Run
    {
        /// <summary>Opens the phase's items; an item already open stays as it is, a done or closed one gets a fresh instance.</summary>
        private void OpenItems(Phase phase, DateTimeOffset t)
        {
            var items = State.Items;
            var opened = new List<string>();
            foreach (var config in _model.ItemsOf(phase))
            {
                if (config is null || string.IsNullOrEmpty(config.Id) || opened.Contains(config.Id))
                {
                    continue;
                }
                if (Current(items, config.Id) is { Status: ItemStatus.Open })
                {
                    continue;
                }
                var due = t + TimeSpan.FromMinutes(Math.Max(0, config.DueWithinMinutes));
                items = items.Add(new ChecklistItemState(config.Id, phase, config.Team, config.Mandatory, t, due, ItemStatus.Open));
                opened.Add(config.Id);
            }
            if (opened.Count > 0)
            {
                State = State with { Items = items };
                Events.Add(new ChecklistOpened(t, phase, opened));
            }
        }

        private void CloseOpenItems(Func<ChecklistItemState, bool> which, ItemStatus status, DateTimeOffset t)
        {
            var closed = new List<string>();
            var items = State.Items.Select(i =>
            {
                if (i.Status == ItemStatus.Open && which(i))
                {
                    closed.Add(i.ItemId);
                    return i with { Status = status };
                }
                return i;
            }).ToImmutableList();
            if (closed.Count > 0)
            {
                State = State with { Items = items };
                Events.Add(new ItemsClosed(t, status, closed));
            }
        }

        /// <summary>The latest instance of an item in the episode (ticks act on it).</summary>
        private static ChecklistItemState? Current(ImmutableList<ChecklistItemState> items, string itemId)
        {
            for (var i = items.Count - 1; i >= 0; i--)
            {
                if (items[i].ItemId == itemId)
                {
                    return items[i];
                }
            }
            return null;
        }

        private string? Tick(TickItem c, DateTimeOffset now)
        {
            if (OpenForAction(c.ItemId) is not { } item)
            {
                return NotOpen(c.ItemId);
            }
            if (OpenPrerequisites(c.ItemId) is { Count: > 0 } before)
            {
                return $"item {c.ItemId} comes after {string.Join(", ", before)}, still open";
            }
            var tick = new ItemTick(c.Actor, c.Team, now, string.IsNullOrWhiteSpace(c.Note) ? null : c.Note);
            State = State with { Items = State.Items.Replace(item, item with { Status = ItemStatus.Done, Tick = tick }) };
            Events.Add(new ItemTicked(now, c.ItemId, tick));
            return null;
        }

        /// <summary>Marks an open item not applicable (R13): it counts as done; undone like a tick.</summary>
        private string? MarkNotApplicable(MarkNotApplicable c, DateTimeOffset now)
        {
            if (OpenForAction(c.ItemId) is not { } item)
            {
                return NotOpen(c.ItemId);
            }
            var mark = new ItemTick(c.Actor, item.Team, now, c.Reason);
            State = State with { Items = State.Items.Replace(item, item with { Status = ItemStatus.NotApplicable, Tick = mark }) };
            Events.Add(new ItemMarkedNotApplicable(now, c.ItemId, c.Actor, c.Reason));
            return null;
        }

        /// <summary>The current instance of the item when it is open; null otherwise (see <see cref="NotOpen"/>).</summary>
        private ChecklistItemState? OpenForAction(string itemId) =>
            Current(State.Items, itemId) is { Status: ItemStatus.Open } item ? item : null;

        /// <summary>Why an item cannot be ticked or marked: it is not open.</summary>
        private string NotOpen(string itemId)
        {
            var item = Current(State.Items, itemId);
            return item?.Status switch
            {
                null => _model.ItemConfigs.TryGetValue(itemId, out var config)
                    ? $"item {itemId} is not open: its {Fmt.Words(config.Phase)} checklist has not been opened"
                    : $"unknown item '{itemId}'",
                ItemStatus.Done => $"item {itemId} already done by {item.Tick!.User} at {Fmt.Time(item.Tick.At)}",
                ItemStatus.NotApplicable => $"item {itemId} already marked not applicable by {item.Tick!.User} at {Fmt.Time(item.Tick.At)}",
                ItemStatus.ClosedNotDone => $"item {itemId} is closed: its episode ended",
                ItemStatus.Voided => $"item {itemId} was voided by re-instatement",
                _ => $"item {itemId} is not open",
            };
        }

        /// <summary>Prerequisites of an item (profile <c>after</c>, R16) whose current instance is neither done nor not applicable.</summary>
        private List<string> OpenPrerequisites(string itemId)
        {
            var open = new List<string>();
            if (!_model.ItemConfigs.TryGetValue(itemId, out var config) || config.Item.After is not { Count: > 0 } after)
            {
                return open;
            }
            foreach (var id in after)
            {
                if (id is not null && Current(State.Items, id) is not { Status: ItemStatus.Done or ItemStatus.NotApplicable })
                {
                    open.Add(id);
                }
            }
            return open;
        }

        private string? Untick(UntickItem c, DateTimeOffset now)
        {
            var item = Current(State.Items, c.ItemId);
            if (item is not { Status: ItemStatus.Done or ItemStatus.NotApplicable, Tick: { } tick })
            {
                return $"item {c.ItemId} is not done";
            }
            if (State.Episode is null)
            {
                return $"item {c.ItemId} belongs to an ended episode";
            }
            State = State with { Items = State.Items.Replace(item, item with { Status = ItemStatus.Open, Tick = null }) };
            Events.Add(new ItemUnticked(now, c.ItemId, c.Actor, c.Reason, tick));
            return null;
        }
    }
}
