using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Cluster;

/// <summary>The leader's answer to a <see cref="ForwardedCommand"/>: the outcome of the normal command path, and who carried it out.</summary>
public sealed record ForwardedOutcome(string Id, string Node, CommandOutcomeKind Kind, string Message, long? AuditSequence)
{
    public CommandOutcome ToOutcome() => new(Kind, Message, AuditSequence);
}
