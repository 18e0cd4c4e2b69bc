using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

/// <summary>An observer's RVR kept in the engine state (docs/engine.md R35): counts until <paramref name="At"/> + the profile's observer maximum age.</summary>
public sealed record ObserverRvr(string Direction, RvrPosition Position, double ValueM, string Observer, string EnteredBy, DateTimeOffset At)
{
    /// <summary>The key in <see cref="EngineState.ObserverRvr"/>, e.g. "07L|Tdz".</summary>
    public static string KeyOf(string direction, RvrPosition position) => $"{direction}|{position}";
}
