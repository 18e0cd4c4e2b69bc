using System.Text.RegularExpressions;

namespace OpsLvp.Core.Review;

/// <summary>
/// The capability manual actions (docs/engine.md R30, R34, R35) of recorded events as actions-file rows
/// (docs/replay.md), read back from the engine's detail texts, so an episode with them replays alike.
/// </summary>
public static partial class CapabilityRecordedCommands
{
    /// <summary>The row for a <c>facility</c>, <c>runway_in_use</c> or <c>observer_rvr</c> manual action; throws <see cref="FormatException"/> naming the detail it cannot read.</summary>
    public static ActionRow Row(DateTimeOffset at, string actor, string action, string detail, string reason)
    {
        ArgumentNullException.ThrowIfNull(detail);
        switch (action)
        {
            case "facility":
            {
                var m = FacilityDetail().Match(detail);
                if (!m.Success)
                {
                    throw new FormatException($"facility detail '{detail}' does not name the facility and status");
                }
                var team = m.Groups["team"].Success ? ":" + m.Groups["team"].Value : "";
                return new ActionRow(at, actor, "facility", m.Groups["id"].Value, m.Groups["status"].Value + team, reason);
            }
            case "runway_in_use":
            {
                var m = RunwayDetail().Match(detail);
                return m.Success
                    ? new ActionRow(at, actor, "runway_in_use", m.Groups["runway"].Value, m.Groups["direction"].Value, reason)
                    : throw new FormatException($"runway_in_use detail '{detail}' does not name the runway and direction");
            }
            case "observer_rvr":
            {
                var m = ObserverDetail().Match(detail);
                return m.Success
                    ? new ActionRow(at, actor, "observer_rvr", $"{m.Groups["direction"].Value}/{m.Groups["position"].Value.ToLowerInvariant()}", $"{m.Groups["value"].Value}:{m.Groups["observer"].Value}", reason)
                    : throw new FormatException($"observer_rvr detail '{detail}' does not name the position, value and observer");
            }
            default:
                throw new FormatException($"manual_action at {at:O}: unknown action '{action}'");
        }
    }

    // "TDZ lights 07L (tdzl-07l) unserviceable (reported by team field-lighting)" (LvpEngine.Capability's detail text)
    [GeneratedRegex(@"\((?<id>[^()\s]+)\) (?<status>serviceable|degraded|unserviceable)( \(reported by team (?<team>[^()]+)\))?$")]
    private static partial Regex FacilityDetail();

    // "runway 07L/25R: 25R in use"
    [GeneratedRegex(@"^runway (?<runway>.+): (?<direction>\S+) in use$")]
    private static partial Regex RunwayDetail();

    // "RVR 07L TDZ 600 m (observer S. Okoro)"
    [GeneratedRegex(@"^RVR (?<direction>\S+) (?<position>TDZ|MID|END) (?<value>[0-9.]+) m \(observer (?<observer>.+)\)$")]
    private static partial Regex ObserverDetail();
}
