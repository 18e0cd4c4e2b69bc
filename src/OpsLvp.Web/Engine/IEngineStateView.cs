using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Engine;

/// <summary>The engine's current committed state as this node's engine host holds it; null before it has restored one (and on a standby).</summary>
public interface IEngineStateView
{
    EngineState? State { get; }

    /// <summary>False when this node's engine will not evaluate (<c>Engine:Enabled=false</c>, or stopped on a state mismatch): no state will come.</summary>
    bool WillEvaluate { get; }
}
