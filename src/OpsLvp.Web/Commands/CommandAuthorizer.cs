using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Web.Commands;

/// <summary>
/// Who may run which command: one static table by command type (the only place the policy lives).
/// Duty managers run every command, ticks and unticks included (they may record a team's action reported by
/// radio); ground staff only tick and untick items owned by one of their teams; viewers, administrators (who
/// manage the profile and users, not the operation) and anonymous callers run nothing.
/// </summary>
public static class CommandAuthorizer
{
    /// <summary>Command type → roles allowed to run it.</summary>
    public static IReadOnlyDictionary<Type, IReadOnlySet<string>> Policy { get; } = new Dictionary<Type, IReadOnlySet<string>>
    {
        [typeof(DeclarePhase)] = Set(Roles.DutyManager),
        [typeof(CancelLvp)] = Set(Roles.DutyManager),
        [typeof(ReleaseHold)] = Set(Roles.DutyManager),
        [typeof(SetForecast)] = Set(Roles.DutyManager),
        [typeof(ReleaseForecast)] = Set(Roles.DutyManager),
        [typeof(SetSensorService)] = Set(Roles.DutyManager),
        [typeof(SetLightStep)] = Set(Roles.DutyManager),
        [typeof(ConfirmPending)] = Set(Roles.DutyManager),
        [typeof(AcknowledgeAlarm)] = Set(Roles.DutyManager),
        [typeof(TickItem)] = Set(Roles.DutyManager, Roles.GroundStaff),
        [typeof(UntickItem)] = Set(Roles.DutyManager, Roles.GroundStaff),
        [typeof(MarkNotApplicable)] = Set(Roles.DutyManager),
        [typeof(SetFacilityStatus)] = Set(Roles.DutyManager, Roles.GroundStaff),
        [typeof(SetRunwayInUse)] = Set(Roles.DutyManager),
        [typeof(EnterObserverRvr)] = Set(Roles.DutyManager),
    };

    /// <summary>Null when <paramref name="caller"/> may run <paramref name="command"/>, else why not (readable).</summary>
    public static string? Check(CommandCaller caller, EngineCommand command, AerodromeProfile profile)
    {
        ArgumentNullException.ThrowIfNull(caller);
        ArgumentNullException.ThrowIfNull(command);
        ArgumentNullException.ThrowIfNull(profile);
        var name = CommandName(command);
        if (!caller.Authenticated)
        {
            return $"sign in to {name}";
        }
        if (!Policy.TryGetValue(command.GetType(), out var allowed) || !allowed.Any(caller.IsInRole))
        {
            return $"your role does not allow you to {name}";
        }
        if (caller.IsInRole(Roles.DutyManager))
        {
            return null;
        }
        if (command is SetFacilityStatus f)
        {
            // ground staff: only their own teams' facilities, reported as that team (docs/engine.md R30)
            var reporter = profile.Capability?.Facilities.FirstOrDefault(x => x is not null && x.Id == f.FacilityId)?.Team;
            return reporter is not null && caller.Teams.Contains(reporter) && f.Team == reporter
                ? null
                : $"facility {f.FacilityId} is reported by another team";
        }
        // ground staff: only their own teams' items
        var itemId = command switch
        {
            TickItem t => t.ItemId,
            UntickItem u => u.ItemId,
            _ => null,
        };
        var owner = ItemTeam(profile, itemId);
        if (owner is null || !caller.Teams.Contains(owner))
        {
            return $"item {itemId} belongs to another team";
        }
        return null;
    }

    /// <summary>The owning team of a checklist item in the profile, or null when the item is unknown.</summary>
    public static string? ItemTeam(AerodromeProfile profile, string? itemId) => CommandPreconditions.ItemTeam(profile, itemId);

    private static string CommandName(EngineCommand command) => command switch
    {
        DeclarePhase => "declare a phase",
        CancelLvp => "cancel LVP",
        ReleaseHold => "release a hold",
        SetForecast => "set the forecast flag",
        SetSensorService => "mark sensors in or out of service",
        SetLightStep => "set the runway-light step",
        ConfirmPending => "confirm a transition",
        AcknowledgeAlarm => "acknowledge alarms",
        TickItem => "tick items",
        UntickItem => "untick items",
        MarkNotApplicable => "mark items not applicable",
        SetFacilityStatus => "report facility status",
        SetRunwayInUse => "change the runway in use",
        EnterObserverRvr => "enter an observer's RVR",
        _ => "run " + command.GetType().Name,
    };

    private static IReadOnlySet<string> Set(params string[] roles) => roles.ToHashSet(StringComparer.Ordinal);
}
