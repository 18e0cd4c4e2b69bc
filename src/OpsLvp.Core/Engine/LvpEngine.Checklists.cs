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
            if (c.ItemId is null || !_model.ItemConfigs.TryGetValue(c.ItemId, out var config))
            {
                return $"unknown item '{c.ItemId}'";
            }
            if (c.Team != config.Item.Team)
            {
                return $"item {c.ItemId} belongs to team {config.Item.Team}, not {c.Team}";
            }
            var item = Current(State.Items, c.ItemId);
            switch (item?.Status)
            {
                case null:
                    return $"item {c.ItemId} is not open: its {Fmt.Name(config.Phase)} checklist has not been opened";
                case ItemStatus.Done:
                    return $"item {c.ItemId} already done by {item.Tick!.User} at {Fmt.Time(item.Tick.At)}";
                case ItemStatus.ClosedNotDone:
                    return $"item {c.ItemId} is closed: its episode ended";
                case ItemStatus.Voided:
                    return $"item {c.ItemId} was voided by re-instatement";
                default:
                    break;
            }
            var tick = new ItemTick(c.Actor, c.Team, now, string.IsNullOrWhiteSpace(c.Note) ? null : c.Note);
            State = State with { Items = State.Items.Replace(item, item with { Status = ItemStatus.Done, Tick = tick }) };
            Events.Add(new ItemTicked(now, c.ItemId, tick));
            return null;
        }

        private string? Untick(UntickItem c, DateTimeOffset now)
        {
            if (c.ItemId is null || !_model.ItemConfigs.ContainsKey(c.ItemId))
            {
                return $"unknown item '{c.ItemId}'";
            }
            if (Blank(c.Reason))
            {
                return "a reason is required to undo a tick";
            }
            var item = Current(State.Items, c.ItemId);
            if (item is not { Status: ItemStatus.Done, Tick: { } tick })
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
