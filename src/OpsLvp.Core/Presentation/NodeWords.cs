namespace OpsLvp.Core.Presentation;

/// <summary>What screens and people are told about the node they use when OpsLvp runs on several nodes (docs/deployment.md "Fan-out").</summary>
public static class NodeWords
{
    /// <summary>Banner headline on a node that does not lead and has not heard from the leader.</summary>
    public const string NotLiveHeadline = "NOT LIVE";

    /// <summary>
    /// The banner's detail on such a node, with why when known (e.g. the fan-out is not connected) and how many reading
    /// batches pushed to this node wait in the reading inbox for a leader (kept, not lost; docs/engine.md R73, R80).
    /// </summary>
    public static string NotLiveReason(string? why, int queuedBatches = 0) =>
        "No state from the engine node since then; values shown are the last received, not live, and actions may not be applied."
        + (why is null ? "" : " " + why)
        + queuedBatches switch
        {
            <= 0 => "",
            1 => " 1 reading batch is queued for the leader.",
            _ => $" {queuedBatches} reading batches are queued for the leader.",
        };

    /// <summary>Told to the person when no engine node took a command in time; the command is withdrawn for good.</summary>
    public static string CommandNotApplied(TimeSpan timeout) =>
        $"not applied: no engine node answered within {DisplayFormat.Duration(timeout)}; the command was withdrawn and will not be carried out later";

    /// <summary>
    /// Told at once when this node could not send the command to the engine node and it is certain that it was not carried
    /// out: nothing was published, or it was withdrawn before any engine node took it. <paramref name="why"/> is short, e.g.
    /// "Redis not connected".
    /// </summary>
    public static string CommandNotSent(string why) =>
        $"not applied: this node cannot reach the engine node ({why}); the command was not carried out. Try again shortly, or from a screen on another node";

    /// <summary>
    /// Told at once when sending the command failed part-way and this node cannot tell whether the engine node received it
    /// (the withdrawal failed too): it may or may not be on record.
    /// </summary>
    public static string CommandSendUnknown(string why) =>
        $"outcome unknown: the link to the engine node failed while the command was being sent ({why}); check the audit log or the screen before repeating it";

    /// <summary>Told when the engine node took the command but its outcome did not come back.</summary>
    public const string CommandOutcomeUnknown =
        "outcome unknown: the engine node took the command but its answer did not arrive; check the audit log before repeating it";

    /// <summary>Told when the engine node took the command and failed while carrying it out: it may or may not be on record.</summary>
    public static string CommandFailedOnEngineNode(string node, string reason) =>
        $"outcome unknown: the engine node {node} failed while carrying out the command ({reason}); check the audit log before repeating it";
}
