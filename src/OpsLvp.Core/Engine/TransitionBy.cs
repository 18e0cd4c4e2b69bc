namespace OpsLvp.Core.Engine;

/// <summary>Who caused a transition: the engine on its conditions, or a person (declare, cancel, confirm).</summary>
public enum TransitionBy
{
    Auto,
    Manual,
}
