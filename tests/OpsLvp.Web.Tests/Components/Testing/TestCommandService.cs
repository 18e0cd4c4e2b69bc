using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Tests.Components.Testing;

/// <summary>
/// Test-only <see cref="ILvpCommandService"/>: records each call and answers with <see cref="NextOutcome"/>,
/// or, when <see cref="Hold"/> is set, only once the test releases it (to observe "sending…").
/// </summary>
public sealed class TestCommandService : ILvpCommandService
{
    private TaskCompletionSource<CommandOutcome>? _held;

    public List<(CommandCaller Caller, EngineCommand Command)> Calls { get; } = [];

    public CommandOutcome NextOutcome { get; set; } = new(CommandOutcomeKind.Applied, "applied (test)", 1);

    /// <summary>When true, each call waits for <see cref="Release"/>.</summary>
    public bool Hold { get; set; }

    public Task<CommandOutcome> ExecuteAsync(CommandCaller caller, EngineCommand command, CancellationToken cancellationToken = default)
    {
        Calls.Add((caller, command));
        if (!Hold)
        {
            return Task.FromResult(NextOutcome);
        }
        _held = new TaskCompletionSource<CommandOutcome>(TaskCreationOptions.RunContinuationsAsynchronously);
        return _held.Task;
    }

    /// <summary>Answers the held call.</summary>
    public void Release(CommandOutcome outcome) =>
        (_held ?? throw new InvalidOperationException("no call is held")).SetResult(outcome);
}
