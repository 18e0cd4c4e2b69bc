namespace OpsLvp.Core.Engine;

/// <summary>Alarm causes (docs/engine.md "Alarms").</summary>
public enum AlarmKind
{
    GoverningRvrUnknown,
    CeilingUnknown,
    SensorSilent,
    ItemOverdue,
    PendingTransition,
    /// <summary>The active condition holds but mandatory preparation items are not all done.</summary>
    SafeguardsIncomplete,
    /// <summary>Raised by the host, not the engine, when audit storage fails.</summary>
    AuditStorageFailing,
    /// <summary>Raised by the host, not the engine, when the engine's time was found ahead of the clock (the clock stepped back).</summary>
    ClockRegression,
    /// <summary>The capability of a runway direction in use went down (docs/engine.md R37).</summary>
    CapabilityDowngrade,
    /// <summary>Raised by the host, not the engine, while pruning old readings (<c>Retention:ReadingsDays</c>) fails (docs/engine.md R78).</summary>
    RetentionFailing,
    /// <summary>Raised by the leader while reading batches pushed to other nodes wait in the reading inbox longer than <c>Cluster:InboxAlarmAfter</c> (docs/engine.md R81).</summary>
    InboxBehind,
    /// <summary>Raised by the leader when it set a failing reading batch of the inbox aside (docs/engine.md R82).</summary>
    InboxBatchSetAside,
}
