using System.Globalization;

namespace OpsLvp.Core.Engine;

/// <summary>What the capability commands must carry (docs/engine.md R30, R34, R35), read by <see cref="CommandPreconditions"/>.</summary>
public static class CapabilityPreconditions
{
    /// <summary>Null when complete and naming things the profile knows; else why not. Other commands: null.</summary>
    public static string? Check(EngineCommand command, Profile.AerodromeProfile profile)
    {
        ArgumentNullException.ThrowIfNull(command);
        ArgumentNullException.ThrowIfNull(profile);
        switch (command)
        {
            case SetFacilityStatus c:
                var facility = profile.Capability?.Facilities.FirstOrDefault(f => f is not null && f.Id == c.FacilityId);
                if (facility is null)
                {
                    return $"unknown facility '{c.FacilityId}'";
                }
                if (!Enum.IsDefined(c.Status))
                {
                    return $"unknown facility status '{c.Status}'";
                }
                if (string.IsNullOrWhiteSpace(c.Reason))
                {
                    return "a reason is required to report a facility's status";
                }
                return c.Team is { } team && team != facility.Team
                    ? $"facility {facility.Id} is reported by team {facility.Team}, not {team}"
                    : null;
            case SetRunwayInUse c:
                var runway = profile.Runways.FirstOrDefault(r => r is not null && r.Id == c.RunwayId);
                if (runway is null)
                {
                    return $"unknown runway '{c.RunwayId}'";
                }
                if (!runway.Directions.Contains(c.Direction))
                {
                    return $"'{c.Direction}' is not a direction of runway {runway.Id} ({string.Join(", ", runway.Directions)})";
                }
                return string.IsNullOrWhiteSpace(c.Reason) ? "a reason is required to change the runway in use" : null;
            case EnterObserverRvr c:
                if (string.IsNullOrWhiteSpace(c.Observer))
                {
                    return "the observer's name is required";
                }
                if (!profile.Runways.Any(r => r?.Directions is not null && r.Directions.Contains(c.Direction)))
                {
                    return $"unknown runway direction '{c.Direction}'";
                }
                if (!Enum.IsDefined(c.Position))
                {
                    return $"unknown RVR position '{c.Position}'";
                }
                var max = Reporting.RvrReporting.UpperLimit.Value;
                return double.IsFinite(c.ValueM) && c.ValueM >= 0 && c.ValueM <= max
                    ? null
                    : $"observed RVR {c.ValueM.ToString(CultureInfo.InvariantCulture)} m is outside 0 to {max.ToString(CultureInfo.InvariantCulture)} m";
            default:
                return null;
        }
    }
}
