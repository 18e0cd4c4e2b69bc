using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Review;

/// <summary>An interval spent in one phase (the bands behind the timeline).</summary>
public sealed record PhaseSpan(Phase Phase, DateTimeOffset From, DateTimeOffset To)
{
    public TimeSpan Duration => To - From;
}
