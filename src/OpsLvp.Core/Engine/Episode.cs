namespace OpsLvp.Core.Engine;

/// <summary>An episode: from leaving normal to returning to it.</summary>
/// <param name="Id">Stable id, e.g. "XDMO-20261201T0312Z".</param>
/// <param name="Start">When normal was left.</param>
/// <param name="DeepestPhase">The most severe phase reached so far.</param>
public sealed record Episode(string Id, DateTimeOffset Start, Phase DeepestPhase);
