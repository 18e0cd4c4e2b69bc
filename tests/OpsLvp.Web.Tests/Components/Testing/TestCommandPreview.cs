using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Tests.Components.Testing;

/// <summary>
/// Test-only <see cref="ICommandPreview"/>: no engine state (null) unless a test gives it a real Core engine and state
/// with <see cref="Use"/>, in which case it previews exactly as the app does (<see cref="LvpEngine.Preview"/>).
/// </summary>
public sealed class TestCommandPreview : ICommandPreview
{
    private Func<EngineCommand, CommandPreview?> _preview = _ => null;

    public List<EngineCommand> Previewed { get; } = [];

    /// <summary>Previews on <paramref name="state"/> at <paramref name="now"/> with the real engine.</summary>
    public void Use(LvpEngine engine, EngineState state, DateTimeOffset now) =>
        _preview = command => engine.Preview(state, command, now);

    public CommandPreview? Preview(EngineCommand command)
    {
        Previewed.Add(command);
        return _preview(command);
    }
}
