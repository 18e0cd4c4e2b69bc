using System.Text.Json;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Engine;

/// <summary>
/// Which engine events become audit entries (docs/engine.md R12) and how: kind = the replay event name
/// (<see cref="EventJson.Name"/>), payload = its JSON line, actor = the person for commands and manual
/// actions, <see cref="EngineActor"/> otherwise. Accepted and rejected readings are not audited one by one:
/// they are kept in the readings table with their reject reason.
/// </summary>
public static class AuditEvents
{
    /// <summary>Actor of entries the engine or the host made on its own.</summary>
    public const string EngineActor = "engine";

    /// <summary>The one entry a recording gap leaves: its start, end, cause and what was refused meanwhile (docs/reliability.md "Storage faults").</summary>
    public const string RecordingGap = "recording_gap";

    /// <summary>
    /// Covers the readings stored since the last covering entry when no transition or engine event did for
    /// <see cref="EngineOptions.ReadingsCoverInterval"/> (docs/audit.md "Readings covered", docs/engine.md R79).
    /// Its payload is only the <c>readingsCovered</c> member.
    /// </summary>
    public const string ReadingsCovered = "readings_covered";

    /// <summary>The readings prune started failing: the on-screen alarm was raised (docs/retention.md "When a run fails", docs/engine.md R78).</summary>
    public const string RetentionAlarmRaised = "retention_alarm_raised";

    /// <summary>A person acknowledged the retention alarm (actor: that person).</summary>
    public const string RetentionAlarmAcknowledged = "retention_alarm_acknowledged";

    /// <summary>A later prune succeeded: the retention alarm was cleared.</summary>
    public const string RetentionAlarmCleared = "retention_alarm_cleared";

    /// <summary>
    /// The leader set a reading batch of the inbox aside after its evaluation failed <c>Cluster:InboxSetAsideAfter</c>
    /// times (docs/engine.md R82): batch id, node, received time, reading count, the error and the body (bounded).
    /// </summary>
    public const string InboxBatchSetAside = "inbox_batch_set_aside";

    /// <summary>Rejected readings and forecasts are logged, not audited (a feed may repeat them every poll; docs/engine.md R25).</summary>
    public static bool IsAudited(EngineEvent e) => e is not ReadingRejected and not ForecastRejected;

    public static string ActorOf(EngineEvent e) => e switch
    {
        PhaseTransition { Actor: { } a } => a,
        TransitionConfirmed c => c.Actor,
        ItemTicked t => t.Tick.User,
        ItemUnticked u => u.Actor,
        ItemMarkedNotApplicable n => n.Actor,
        AlarmAcknowledged a => a.Actor,
        ManualActionApplied m => m.Actor,
        CommandRefused c => c.Command.Actor,
        _ => EngineActor,
    };

    public static NewAuditEntry ToEntry(EngineEvent e) => new(ActorOf(e), EventJson.Name(e), EventJson.ToLine(e), e.At);

    /// <summary>An entry the host itself records (feed lost/restored, audit storage recovered).</summary>
    public static NewAuditEntry HostEntry(string kind, DateTimeOffset at, object payload) =>
        new(EngineActor, kind, JsonSerializer.Serialize(payload, JsonSerializerOptions.Web), at);
}
