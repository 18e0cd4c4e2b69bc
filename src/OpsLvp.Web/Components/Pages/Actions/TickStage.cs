namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>Where a tablet item card is in the tap → confirm → send → server state cycle.</summary>
public enum TickStage
{
    /// <summary>Showing the server's state of the item.</summary>
    Idle,
    /// <summary>Asking "done?" with an optional note.</summary>
    Confirming,
    /// <summary>Asking for the mandatory reason to undo.</summary>
    UndoReason,
    /// <summary>Asking a duty manager for the mandatory reason to mark the item not applicable (docs/engine.md R13).</summary>
    NotApplicableReason,
    /// <summary>Sent; waiting for the command's outcome and then for the next snapshot.</summary>
    Sending,
}
