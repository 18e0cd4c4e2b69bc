namespace OpsLvp.Core.Engine;

/// <summary>State of a checklist item.</summary>
public enum ItemStatus
{
    Open,
    Done,
    /// <summary>The episode ended with the item still open (DESIGN R11).</summary>
    ClosedNotDone,
    /// <summary>A cancellation item voided by re-instatement of LVP (DESIGN R8).</summary>
    Voided,
}
