namespace OpsLvp.Web.Commands;

/// <summary>What became of a command, with a message a person can read.</summary>
/// <param name="Kind">Applied, refused (role, input or engine said no) or failed (audit could not be committed).</param>
/// <param name="Message">E.g. "Item already done by J. Ferreira at 03:12 UTC".</param>
/// <param name="AuditSequence">The audit entry that recorded it, when applied.</param>
public sealed record CommandOutcome(CommandOutcomeKind Kind, string Message, long? AuditSequence = null)
{
    public bool Applied => Kind == CommandOutcomeKind.Applied;
}
