using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The server log's account of the night (issue 13; docs/deployment.md "The server log"): one Information line per
/// phase transition, proposal, confirmation, withdrawal, manual action, checklist tick, alarm raised, cleared or
/// acknowledged, and feed-health change on record, in the words of <see cref="LvpVocabulary"/> and
/// <see cref="AlarmWords"/> (never "->"). Written by the engine host only after the evaluation's audit commit, so
/// the log never tells of something the history does not hold.
/// </summary>
public static class NightLog
{
    /// <summary>Log category of the night's lines, so an operator can set its level apart from the rest.</summary>
    public const string Category = "OpsLvp.Night";

    /// <summary>The line for <paramref name="e"/>, or null when the event is not part of the night's account (readings, refusals, item bookkeeping).</summary>
    public static string? Line(EngineEvent e)
    {
        ArgumentNullException.ThrowIfNull(e);
        var at = DisplayFormat.UtcDateTime(e.At);
        return e switch
        {
            PhaseTransition t => $"{at} phase: {LvpVocabulary.Change(t.From, t.To)} ({By(t)}): {AlarmWords.Words(t.Reason)}",
            TransitionProposed p => $"{at} proposed: {LvpVocabulary.Change(p.From, p.To)}, waiting for a duty manager's confirmation: {AlarmWords.Words(p.Reason)}",
            TransitionConfirmed c => $"{at} confirmed: {LvpVocabulary.Change(c.From, c.To)} by {c.Actor}, proposed {DisplayFormat.UtcDateTime(c.ProposedAt)}{Because(c.Reason)}",
            ProposalWithdrawn w => $"{at} proposal withdrawn: {LvpVocabulary.Change(w.From, w.To)}, proposed {DisplayFormat.UtcDateTime(w.ProposedAt)}: {AlarmWords.Words(w.Reason)}",
            ManualActionApplied m => $"{at} manual action by {m.Actor}: {AlarmWords.Words(m.Detail)}{Because(m.Reason)}",
            ItemTicked t => $"{at} item {t.ItemId} done by {t.Tick.User}",
            ItemUnticked u => $"{at} item {u.ItemId} tick undone by {u.Actor}{Because(u.Reason)}",
            ItemMarkedNotApplicable n => $"{at} item {n.ItemId} marked not applicable by {n.Actor}{Because(n.Reason)}",
            AlarmRaised r => $"{at} alarm raised: {AlarmWords.Label(r.Alarm.Kind)}: {AlarmWords.Message(r.Alarm, null)}",
            AlarmCleared c => $"{at} alarm cleared: {AlarmWords.Label(c.Kind)} ({c.Key})",
            AlarmAcknowledged a => $"{at} alarm acknowledged: {AlarmWords.Label(a.Kind)} ({a.Key}) by {a.Actor}",
            _ => null,
        };
    }

    /// <summary>The line for a feed-health change the engine host put on record.</summary>
    public static string FeedLine(FeedHealthJournal.Proposal change, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(change);
        var what = change.Entry.Kind switch
        {
            "feed_lost" => "lost",
            "feed_restored" => "restored",
            "feed_degraded" => "degraded",
            _ => "changed and came back",
        };
        var status = OpsLvp.Web.Feeds.FeedHealthDto.StatusText(change.Status);
        var count = change.Changes == 1 ? "1 change" : $"{change.Changes} changes";
        return $"{DisplayFormat.UtcDateTime(at)} feed {change.Feed} {what}: now {status} ({count} since the last entry)";
    }

    /// <summary>Writes the lines of <paramref name="events"/> and <paramref name="feedChanges"/>, one Information line each.</summary>
    public static void Write(ILogger logger, IEnumerable<EngineEvent> events, IEnumerable<FeedHealthJournal.Proposal> feedChanges, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(logger);
        ArgumentNullException.ThrowIfNull(events);
        ArgumentNullException.ThrowIfNull(feedChanges);
        if (!logger.IsEnabled(LogLevel.Information))
        {
            return;
        }
        foreach (var e in events)
        {
            if (Line(e) is { } line)
            {
                logger.LogInformation("{NightLine}", line);
            }
        }
        foreach (var change in feedChanges)
        {
            logger.LogInformation("{NightLine}", FeedLine(change, now));
        }
    }

    private static string By(PhaseTransition t) => t.By switch
    {
        TransitionBy.Auto => "on the conditions",
        _ => t.Actor is { } a ? $"by {a}" : "by hand",
    };

    private static string Because(string? reason) => string.IsNullOrWhiteSpace(reason) ? "" : $"; reason: {AlarmWords.Words(reason)}";
}
