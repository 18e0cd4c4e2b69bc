namespace OpsLvp.Core.Profile;

/// <summary>A runway, e.g. id "09/27" with directions "09" and "27".</summary>
/// <param name="Id">Runway id, unique in the profile.</param>
/// <param name="Directions">Its runway designators, e.g. ["09","27"].</param>
/// <param name="Lvp">Whether this runway is listed for LVP (its RVR governs, docs/engine.md R3).</param>
/// <param name="DirectionInUse">The direction in use, which names positions for display; default the first.</param>
public sealed record RunwayConfig(string Id, IReadOnlyList<string> Directions, bool Lvp = true, string? DirectionInUse = null);
