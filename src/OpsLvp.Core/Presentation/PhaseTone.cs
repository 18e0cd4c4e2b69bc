namespace OpsLvp.Core.Presentation;

/// <summary>The colour family a state is drawn in on every screen (each screen maps it to its own CSS class).</summary>
public enum PhaseTone
{
    Normal,
    Preparation,
    Warning,
    Active,
    Cancellation,
}
