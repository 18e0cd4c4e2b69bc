using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Commands;

/// <summary>
/// What a command would do if sent now (docs/engine.md R40), for dialogs that ask before a command is sent: the
/// engine's own evaluation on a copy of the live state. Nothing is recorded or published.
/// </summary>
public interface ICommandPreview
{
    /// <summary>The preview of <paramref name="command"/> against the live state, or null while the engine has no state.</summary>
    CommandPreview? Preview(EngineCommand command);
}
