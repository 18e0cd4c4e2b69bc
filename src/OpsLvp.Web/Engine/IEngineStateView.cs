using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Engine;

/// <summary>The engine's current committed state as this node's engine host holds it; null before it has restored one (and on a standby).</summary>
public interface IEngineStateView
{
    EngineState? State { get; }
}
