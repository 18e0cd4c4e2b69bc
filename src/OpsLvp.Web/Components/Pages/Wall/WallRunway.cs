namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>An LVP runway: the direction in use and its three positions.</summary>
public sealed record WallRunway(string Title, string RunwayId, IReadOnlyList<WallPosition> Positions);
