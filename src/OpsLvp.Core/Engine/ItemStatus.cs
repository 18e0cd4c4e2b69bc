namespace OpsLvp.Core.Engine;

/// <summary>State of a checklist item.</summary>
public enum ItemStatus
{
    Open,
    Done,
    /// <summary>The episode ended with the item still open (docs/engine.md R11).</summary>
    ClosedNotDone,
    /// <summary>A cancellation item voided by re-instatement of LVP (docs/engine.md R8).</summary>
    Voided,
    /// <summary>Marked not applicable by a duty manager with a reason (docs/engine.md R13); counts as done.</summary>
    NotApplicable,
}
