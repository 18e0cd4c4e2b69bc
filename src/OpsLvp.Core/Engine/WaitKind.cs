namespace OpsLvp.Core.Engine;

/// <summary>Kinds of things the engine can be waiting for.</summary>
public enum WaitKind
{
    /// <summary>An escalation condition holds and its enter dwell is running.</summary>
    EscalationDwell,
    /// <summary>A recovery condition holds and its recover dwell is running.</summary>
    RecoveryDwell,
    /// <summary>A transition waits for a duty manager's confirmation.</summary>
    Confirmation,
    /// <summary>Cancellation ends when these mandatory items are done.</summary>
    CancellationItems,
    /// <summary>Recovery cannot hold: an input is unknown or a sensor silent.</summary>
    RecoveryBlocked,
    /// <summary>A declared hold prevents automatic relaxation.</summary>
    Hold,
    /// <summary>The active condition is met but these mandatory preparation items are open (docs/engine.md R13).</summary>
    Safeguards,
}
