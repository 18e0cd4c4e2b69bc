using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Review;

/// <summary>
/// Checklist performance of one episode, from its recorded events and the profile it ran under: per item
/// opened, done, by whom, late or not; preparation start → preparation safeguards complete (every mandatory
/// preparation item done); condition → confirmation per pending transition; time in each phase.
/// </summary>
/// <param name="PreparationStart">First entry into preparation; null when the episode never was in preparation.</param>
/// <param name="SafeguardsComplete">When the last mandatory preparation item was done; null when not all were.</param>
public sealed record ChecklistPerformance(
    IReadOnlyList<ItemPerformance> Items,
    DateTimeOffset? PreparationStart,
    DateTimeOffset? SafeguardsComplete,
    IReadOnlyList<ConfirmationDelay> Confirmations,
    IReadOnlyDictionary<Phase, TimeSpan> TimeInPhase)
{
    /// <summary>Preparation start → safeguards complete.</summary>
    public TimeSpan? PreparationToSafeguards => SafeguardsComplete - PreparationStart;

    /// <summary>Computes the figures; <paramref name="end"/> is the episode end (or the review instant while running).</summary>
    public static ChecklistPerformance Compute(IReadOnlyList<RecordedEvent> events, AerodromeProfile profile, DateTimeOffset start, DateTimeOffset end)
    {
        ArgumentNullException.ThrowIfNull(events);
        ArgumentNullException.ThrowIfNull(profile);
        var configs = profile.Checklists.Preparation.Concat(profile.Checklists.Active).Concat(profile.Checklists.Cancellation)
            .GroupBy(c => c.Id).ToDictionary(g => g.Key, g => g.First());
        var items = new List<Item>();
        var ordered = events.OrderBy(e => e.At).ToList();
        foreach (var e in ordered)
        {
            switch (e.Name)
            {
                case "checklist_opened":
                    var phase = e.PhaseField("phase") ?? throw new FormatException($"checklist_opened at {e.At:O} has no phase");
                    foreach (var id in e.Strings("items"))
                    {
                        configs.TryGetValue(id, out var config);
                        items.Add(new Item(id, phase, config?.Team ?? "", config?.Mandatory ?? true, e.At, e.At.AddMinutes(config?.DueWithinMinutes ?? 0)));
                    }
                    break;
                case "item_ticked":
                    if (Latest(items, e.Str("item")) is { } ticked)
                    {
                        ticked.DoneAt = e.At;
                        ticked.DoneBy = e.Str("actor");
                        ticked.DoneForTeam = e.Str("team");
                        ticked.Outcome = "done";
                    }
                    break;
                case "item_not_applicable":
                    // counts as done for safeguards (docs/engine.md R13); the outcome says which
                    if (Latest(items, e.Str("item")) is { } marked)
                    {
                        marked.DoneAt = e.At;
                        marked.DoneBy = e.Str("actor");
                        marked.DoneForTeam = null;
                        marked.Outcome = "not_applicable";
                    }
                    break;
                case "item_unticked":
                    if (Latest(items, e.Str("item")) is { } unticked)
                    {
                        unticked.DoneAt = null;
                        unticked.DoneBy = null;
                        unticked.DoneForTeam = null;
                        unticked.Outcome = "open";
                    }
                    break;
                case "items_closed":
                    foreach (var id in e.Strings("items"))
                    {
                        if (Latest(items, id) is { Outcome: "open" } closed)
                        {
                            closed.Outcome = e.Str("status") ?? "closed_not_done";
                        }
                    }
                    break;
                default:
                    break;
            }
        }
        var transitions = EpisodeModel.Transitions(ordered);
        var preparationStart = transitions.FirstOrDefault(t => t.To == Phase.Preparation)?.At;
        DateTimeOffset? safeguards = null;
        var prepItems = items.Where(i => i.Phase == Phase.Preparation && i.Mandatory).ToList();
        if (preparationStart is not null && prepItems.Count > 0 && prepItems.All(i => i.DoneAt is not null))
        {
            safeguards = prepItems.Max(i => i.DoneAt);
        }
        var spans = EpisodeModel.Spans(transitions, start, end);
        var timeIn = Enum.GetValues<Phase>().ToDictionary(p => p, p => spans.Where(s => s.Phase == p).Aggregate(TimeSpan.Zero, (sum, s) => sum + s.Duration));
        return new ChecklistPerformance(
            items.Select(i => i.ToPerformance(end)).ToList(),
            preparationStart,
            safeguards,
            PendingTransitions(ordered),
            timeIn);
    }

    private static List<ConfirmationDelay> PendingTransitions(IReadOnlyList<RecordedEvent> ordered)
    {
        var list = new List<ConfirmationDelay>();
        foreach (var p in ordered.Where(e => e.Name == "proposal"))
        {
            var from = p.PhaseField("from") ?? Phase.Normal;
            var to = p.PhaseField("to") ?? Phase.Normal;
            var confirmed = ordered.FirstOrDefault(e => e.Name == "confirmation" && e.TimeField("proposed_at") == p.At && e.PhaseField("to") == to);
            var withdrawn = ordered.FirstOrDefault(e => e.Name == "proposal_withdrawn" && e.TimeField("proposed_at") == p.At && e.PhaseField("to") == to);
            list.Add(confirmed is not null
                ? new ConfirmationDelay(from, to, p.At, confirmed.At, confirmed.Str("actor"), "confirmed")
                : new ConfirmationDelay(from, to, p.At, null, null, withdrawn is not null ? "withdrawn" : "pending"));
        }
        return list;
    }

    private static Item? Latest(List<Item> items, string? id) => items.LastOrDefault(i => i.Id == id);

    private sealed class Item(string id, Phase phase, string team, bool mandatory, DateTimeOffset openedAt, DateTimeOffset dueAt)
    {
        public string Id { get; } = id;
        public Phase Phase { get; } = phase;
        public bool Mandatory { get; } = mandatory;
        public DateTimeOffset? DoneAt { get; set; }
        public string? DoneBy { get; set; }
        public string? DoneForTeam { get; set; }
        public string Outcome { get; set; } = "open";

        public ItemPerformance ToPerformance(DateTimeOffset end) => new(
            Id, Phase, team, Mandatory, openedAt, dueAt, DoneAt, DoneBy, DoneForTeam,
            DoneAt is { } done ? done > dueAt : end >= dueAt,
            Outcome);
    }
}
