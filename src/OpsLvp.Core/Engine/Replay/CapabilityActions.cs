using System.Globalization;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// The capability actions of the actions CSV (docs/replay.md): <c>facility</c> (target facility id, value
/// serviceable|degraded|unserviceable, optionally <c>:team</c> for a team's report), <c>runway_in_use</c> (target runway
/// id, value the direction), <c>observer_rvr</c> (target direction and position as <c>07L/tdz</c>, value
/// <c>metres:observer name</c>).
/// </summary>
public static class CapabilityActions
{
    public static EngineCommand Parse(string action, string actor, string target, string value, string reason, Func<string, FormatException> error)
    {
        ArgumentNullException.ThrowIfNull(error);
        switch (action)
        {
            case "facility":
            {
                if (target.Length == 0)
                {
                    throw error("target (facility id) is empty");
                }
                var parts = value.Split(':', 2);
                var status = parts[0] switch
                {
                    "serviceable" => FacilityStatus.Serviceable,
                    "degraded" => FacilityStatus.Degraded,
                    "unserviceable" => FacilityStatus.Unserviceable,
                    _ => throw error($"facility value must be serviceable, degraded or unserviceable (optionally :team), not '{value}'"),
                };
                return new SetFacilityStatus(actor, target, status, reason, parts.Length > 1 && parts[1].Length > 0 ? parts[1] : null);
            }
            case "runway_in_use":
                if (target.Length == 0 || value.Length == 0)
                {
                    throw error("runway_in_use needs target (runway id) and value (direction)");
                }
                return new SetRunwayInUse(actor, target, value, reason);
            case "observer_rvr":
            {
                var site = target.Split('/', 2);
                if (site.Length != 2 || site[0].Length == 0 || !TryPosition(site[1], out var position))
                {
                    throw error($"observer_rvr target must be direction/position (e.g. 07L/tdz), not '{target}'");
                }
                var parts = value.Split(':', 2);
                if (parts.Length != 2 || parts[1].Trim().Length == 0
                    || !double.TryParse(parts[0], NumberStyles.AllowDecimalPoint, CultureInfo.InvariantCulture, out var metres))
                {
                    throw error($"observer_rvr value must be metres:observer (e.g. 600:sam), not '{value}'");
                }
                return new EnterObserverRvr(actor, site[0], position, metres, parts[1].Trim(), reason.Length == 0 ? null : reason);
            }
            default:
                throw error($"unknown action '{action}'");
        }
    }

    private static bool TryPosition(string text, out RvrPosition position)
    {
        position = text.ToLowerInvariant() switch
        {
            "tdz" => RvrPosition.Tdz,
            "mid" => RvrPosition.Mid,
            "end" => RvrPosition.End,
            _ => (RvrPosition)(-1),
        };
        return Enum.IsDefined(position);
    }
}
