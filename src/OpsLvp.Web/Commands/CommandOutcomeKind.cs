namespace OpsLvp.Web.Commands;

/// <summary>See <see cref="CommandOutcome"/>.</summary>
public enum CommandOutcomeKind
{
    Applied,
    Refused,
    Failed,
}
