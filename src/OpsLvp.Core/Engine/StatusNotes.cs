namespace OpsLvp.Core.Engine;

/// <summary>
/// The short notes every screen shows beside the phase (docs/engine.md R13, R15): one wording for wall, console and
/// tablet. Empty when there is nothing to add to the phase name.
/// </summary>
public static class StatusNotes
{
    /// <summary>Start of the note shown beside the phase while the server is not recording.</summary>
    public const string NotRecordingNote = "phase as last recorded before";

    /// <summary>
    /// The notes for <paramref name="status"/>, most important first. Open safeguards are named by
    /// <paramref name="itemText"/> (the profile's item texts) when given and it knows the item, else by their ids.
    /// </summary>
    public static IReadOnlyList<string> For(EngineStatus status, Func<string, string?>? itemText = null)
    {
        ArgumentNullException.ThrowIfNull(status);
        var notes = new List<string>();
        // While storage fails no reading is evaluated (docs/reliability.md "Storage faults"): the phase on screen is the
        // last recorded one and may no longer match the weather, so say so beside it on every screen.
        if (status.Alarms.FirstOrDefault(a => a.Kind == AlarmKind.AuditStorageFailing) is { } notRecording)
        {
            notes.Add($"{NotRecordingNote} {notRecording.RaisedAt.UtcDateTime.ToString("HH:mm:ss'Z'", System.Globalization.CultureInfo.InvariantCulture)}");
        }
        if (status.ConditionsMetSafeguardsIncomplete)
        {
            notes.Add($"{LvpEngine.SafeguardsIncompleteHeadline}: {string.Join(itemText is null ? ", " : "; ", status.SafeguardsOutstanding.Select(id => itemText?.Invoke(id) ?? id))} open");
        }
        if (status.SafeguardsOverride is { } o)
        {
            notes.Add($"in force over open safeguards: override by {o.Actor} at {Fmt.Time(o.At)} ({o.Reason})");
        }
        if (status.RelaxedAgainstConditions is { } r)
        {
            notes.Add($"relaxed by {r.Actor} against conditions ({Fmt.Change(r.From, r.To)} at {Fmt.Time(r.At)})");
        }
        return notes;
    }
}
