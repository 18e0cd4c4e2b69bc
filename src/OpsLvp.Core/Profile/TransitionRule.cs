using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Profile;

/// <summary>A transition named by its phases, e.g. preparation → active.</summary>
public sealed record TransitionRule(Phase From, Phase To);
