using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Capability;

/// <summary>An RVR position an operation needs and the least RVR there, in metres (a local value; inclusive: RVR ≥ minimum meets it).</summary>
public sealed record RvrMinimum(RvrPosition Position, double MinimumM);
