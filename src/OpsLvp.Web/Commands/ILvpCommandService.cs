using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Commands;

/// <summary>
/// The one way a person's action reaches the engine: checks the caller's role (and team for ticks), validates
/// input, evaluates, commits the audit entries with the new state in one transaction, and only then applies and
/// broadcasts. Components call this; they hold no decision logic.
/// </summary>
public interface ILvpCommandService
{
    /// <summary>Runs <paramref name="command"/> for <paramref name="caller"/>. The command's Actor is replaced by the caller's name.</summary>
    Task<CommandOutcome> ExecuteAsync(CommandCaller caller, EngineCommand command, CancellationToken cancellationToken = default);
}
