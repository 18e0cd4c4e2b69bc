using OpsLvp.Core.Capability;

namespace OpsLvp.Core.Engine;

/// <summary>
/// Report a facility's status (docs/engine.md R30): serviceable, degraded or unserviceable, always with a reason.
/// <paramref name="Team"/> is the reporting team when a team's tablet reports (it must own the facility); null for a
/// duty manager or an ingest system, which may report any facility.
/// </summary>
public sealed record SetFacilityStatus(string Actor, string FacilityId, FacilityStatus Status, string Reason, string? Team = null) : EngineCommand(Actor);
