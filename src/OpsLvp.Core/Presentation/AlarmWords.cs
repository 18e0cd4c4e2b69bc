using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Presentation;

/// <summary>How every screen words an alarm: its kind's label and its message in the words of <see cref="LvpVocabulary"/>.</summary>
public static class AlarmWords
{
    /// <summary>Short label of an alarm kind ("RVR unknown", "Confirm phase change").</summary>
    public static string Label(AlarmKind kind) => kind switch
    {
        AlarmKind.GoverningRvrUnknown => "RVR unknown",
        AlarmKind.CeilingUnknown => "Ceiling unknown",
        AlarmKind.SensorSilent => "Sensor silent",
        AlarmKind.ItemOverdue => "Item overdue",
        AlarmKind.PendingTransition => "Confirm phase change",
        AlarmKind.SafeguardsIncomplete => "Safeguards incomplete",
        AlarmKind.AuditStorageFailing => "Audit storage failing",
        AlarmKind.ClockRegression => "Clock stepped back",
        AlarmKind.CapabilityDowngrade => "Runway capability down",
        AlarmKind.RetentionFailing => "Readings retention failing",
        AlarmKind.InboxBehind => "Readings from other nodes waiting",
        AlarmKind.InboxBatchSetAside => "Reading batch set aside",
        _ => kind.ToString(),
    };

    /// <summary>
    /// The alarm's text for a screen. A pending-transition alarm is worded from the pending transition itself
    /// ("confirm LVP preparation to LVP in force: …"); other texts are the engine's, with any ASCII arrow between
    /// phase names written as words.
    /// </summary>
    public static string Message(Alarm alarm, PendingTransition? pending)
    {
        ArgumentNullException.ThrowIfNull(alarm);
        if (alarm.Kind == AlarmKind.PendingTransition && pending is not null)
        {
            return $"confirm {LvpVocabulary.Change(pending.From, pending.To)}: {pending.Reason}";
        }
        return Words(alarm.Message);
    }

    /// <summary>An engine text (a reason, a detail) with any ASCII arrow between phase names written as the vocabulary's words.</summary>
    public static string Words(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        foreach (var from in Enum.GetValues<Phase>())
        {
            foreach (var to in Enum.GetValues<Phase>())
            {
                text = text.Replace($"{Code(from)} -> {Code(to)}", LvpVocabulary.Change(from, to), StringComparison.Ordinal);
            }
        }
        return text.Replace("->", "to", StringComparison.Ordinal);
    }

    private static string Code(Phase phase) => LvpVocabulary.For(phase).Code;
}
