namespace OpsLvp.Core.Engine;

/// <summary>RVR along one LVP runway for the direction in use.</summary>
public sealed record RunwayRvrStatus(string RunwayId, string Direction, IReadOnlyList<PositionRvr> Positions);
