using OpsLvp.Core.Engine;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Commands;

/// <summary>
/// <see cref="ICommandPreview"/> over the live engine host: <see cref="LvpEngine.Preview"/> on the host's current state
/// (immutable, so the live engine is untouched) at the app clock's now.
/// </summary>
public sealed class EngineCommandPreview(LiveEngineHost host, TimeProvider clock) : ICommandPreview
{
    public CommandPreview? Preview(EngineCommand command)
    {
        ArgumentNullException.ThrowIfNull(command);
        if (host.Profile is not { } profile || host.State is not { } state)
        {
            return null;
        }
        return new LvpEngine(profile).Preview(state, command, clock.GetUtcNow());
    }
}
