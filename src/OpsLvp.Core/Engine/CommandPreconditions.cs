using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

/// <summary>
/// What a command must carry before anything else is looked at (docs/engine.md R9–R11, R13): a reason where one
/// is asked for, an item, sensor or phase the profile knows, the team that owns the item. One place and one
/// wording for the engine (which refuses with <see cref="CommandRefused"/>) and the web command service (which
/// refuses before the command reaches the engine). Whether the state allows the command (a hold to release, an
/// open item to tick) is the engine's to decide; whether the caller's role allows it is the host's.
/// </summary>
public static class CommandPreconditions
{
    /// <summary>Null when <paramref name="command"/> is complete and names things <paramref name="profile"/> knows; else why not.</summary>
    public static string? Check(EngineCommand command, AerodromeProfile profile)
    {
        ArgumentNullException.ThrowIfNull(command);
        ArgumentNullException.ThrowIfNull(profile);
        switch (command)
        {
            case DeclarePhase c:
                if (c.Phase is not (Phase.Preparation or Phase.Active))
                {
                    return $"only {Fmt.Words(Phase.Preparation)} or {Fmt.Words(Phase.Active)} can be declared, not {Fmt.Words(c.Phase)}";
                }
                if (Blank(c.Reason))
                {
                    return "a reason is required to declare a phase";
                }
                if (c.SafeguardsOverride is { } why && Blank(why))
                {
                    return "a reason is required to override open safeguards";
                }
                return null;
            case CancelLvp c:
                return Blank(c.Reason) ? "a reason is required to cancel" : null;
            case ReleaseHold c:
                return Blank(c.Reason) ? "a reason is required to release a hold" : null;
            case SetForecast c:
                return Blank(c.Reason) ? "a reason is required to set or clear the forecast" : null;
            case ReleaseForecast c:
                return Blank(c.Reason) ? "a reason is required to release the manual forecast setting" : null;
            case SetSensorService c:
                if (Blank(c.Reason))
                {
                    return "a reason is required to change a sensor's service state";
                }
                return c.SensorId is null || !profile.Sensors.Any(s => s is not null && s.Id == c.SensorId)
                    ? $"unknown sensor '{c.SensorId}'"
                    : null;
            case SetLightStep c:
                if (Blank(c.Reason))
                {
                    return "a reason is required to set the light step";
                }
                return c.Step == 0 || profile.Lights.IntensityCdByStep.ContainsKey(c.Step)
                    ? null
                    : $"light step {c.Step} is not configured (steps: 0 (off), {string.Join(", ", profile.Lights.IntensityCdByStep.Keys.Order())})";
            case AcknowledgeAlarm c:
                return Blank(c.AlarmKey) ? "no alarm named" : null;
            case TickItem c:
                if (ItemTeam(profile, c.ItemId) is not { } owner)
                {
                    return $"unknown item '{c.ItemId}'";
                }
                return c.Team != owner ? $"item {c.ItemId} belongs to team {owner}, not {c.Team}" : null;
            case UntickItem c:
                if (ItemTeam(profile, c.ItemId) is null)
                {
                    return $"unknown item '{c.ItemId}'";
                }
                return Blank(c.Reason) ? "a reason is required to undo a tick" : null;
            case MarkNotApplicable c:
                if (ItemTeam(profile, c.ItemId) is null)
                {
                    return $"unknown item '{c.ItemId}'";
                }
                return Blank(c.Reason) ? "a reason is required to mark an item not applicable" : null;
            default:
                return CapabilityPreconditions.Check(command, profile);
        }
    }

    /// <summary>The owning team of a checklist item in the profile, or null when the item is unknown.</summary>
    public static string? ItemTeam(AerodromeProfile profile, string? itemId)
    {
        ArgumentNullException.ThrowIfNull(profile);
        if (itemId is null)
        {
            return null;
        }
        foreach (var list in new[] { profile.Checklists.Preparation, profile.Checklists.Active, profile.Checklists.Cancellation })
        {
            foreach (var item in list)
            {
                if (item is not null && item.Id == itemId)
                {
                    return item.Team;
                }
            }
        }
        return null;
    }

    private static bool Blank(string? s) => string.IsNullOrWhiteSpace(s);
}
