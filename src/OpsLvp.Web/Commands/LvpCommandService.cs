using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Commands;

/// <summary>
/// <see cref="ILvpCommandService"/>: role check (<see cref="CommandAuthorizer"/>), input validation, then the engine
/// host's single evaluation path, which commits the audit entries with the new state before applying and publishing.
/// </summary>
public sealed class LvpCommandService(LiveEngineHost host, ILogger<LvpCommandService> logger) : ILvpCommandService
{
    /// <summary>Told to the user when the audit entry could not be committed (DESIGN R12).</summary>
    public const string NotRecordedMessage = "not applied: audit could not be recorded";

    public async Task<CommandOutcome> ExecuteAsync(CommandCaller caller, EngineCommand command, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(caller);
        ArgumentNullException.ThrowIfNull(command);
        if (host.Profile is not { } profile)
        {
            return new CommandOutcome(CommandOutcomeKind.Failed, "not applied: the engine is not running");
        }
        if (CommandAuthorizer.Check(caller, command, profile) is { } denied)
        {
            return new CommandOutcome(CommandOutcomeKind.Refused, denied);
        }
        if (Validate(command, profile) is { } invalid)
        {
            return new CommandOutcome(CommandOutcomeKind.Refused, invalid);
        }
        var named = WithActor(command, caller.Name, profile);
        var outcome = await host.ExecuteAsync(named, cancellationToken);
        if (!outcome.Committed)
        {
            logger.LogWarning("Command {Command} by {Actor} not applied: {Error}", named.GetType().Name, caller.Name, outcome.Error);
            return new CommandOutcome(CommandOutcomeKind.Failed, $"{NotRecordedMessage} ({outcome.Error})");
        }
        var refused = outcome.Events.OfType<CommandRefused>().FirstOrDefault(r => ReferenceEquals(r.Command, named));
        var refusedSequence = outcome.Entries.LastOrDefault(e => e.Kind == "command_refused")?.Sequence;
        if (refused is not null)
        {
            return new CommandOutcome(CommandOutcomeKind.Refused, refused.Reason, refusedSequence);
        }
        var entry = outcome.Entries.FirstOrDefault(e => e.Actor == caller.Name) ?? outcome.Entries.LastOrDefault();
        return new CommandOutcome(CommandOutcomeKind.Applied, Describe(named), entry?.Sequence);
    }

    /// <summary>Null when the input is complete and names known things; else what is wrong.</summary>
    public static string? Validate(EngineCommand command, AerodromeProfile profile)
    {
        static bool Blank(string? s) => string.IsNullOrWhiteSpace(s);
        return command switch
        {
            DeclarePhase d when d.Phase is not (Phase.Preparation or Phase.Active) => "only preparation or active can be declared",
            DeclarePhase d when Blank(d.Reason) => "a reason is required to declare a phase",
            CancelLvp c when Blank(c.Reason) => "a reason is required to cancel LVP",
            ReleaseHold r when Blank(r.Reason) => "a reason is required to release a hold",
            SetForecast f when Blank(f.Reason) => "a reason is required to set or clear the forecast",
            SetSensorService s when Blank(s.SensorId) || !profile.Sensors.Any(x => x?.Id == s.SensorId) => $"unknown sensor '{s.SensorId}'",
            SetSensorService s when Blank(s.Reason) => "a reason is required to change a sensor's service state",
            AcknowledgeAlarm a when Blank(a.AlarmKey) => "no alarm named",
            TickItem t when CommandAuthorizer.ItemTeam(profile, t.ItemId) is null => $"unknown checklist item '{t.ItemId}'",
            TickItem t when !Blank(t.Team) && !profile.Teams.Any(x => x?.Id == t.Team) => $"unknown team '{t.Team}'",
            UntickItem u when CommandAuthorizer.ItemTeam(profile, u.ItemId) is null => $"unknown checklist item '{u.ItemId}'",
            UntickItem u when Blank(u.Reason) => "a reason is required to undo a tick",
            _ => null,
        };
    }

    private static EngineCommand WithActor(EngineCommand command, string actor, AerodromeProfile profile) => command switch
    {
        // a tick without a team is for the item's own team
        TickItem t when string.IsNullOrWhiteSpace(t.Team) => t with { Actor = actor, Team = CommandAuthorizer.ItemTeam(profile, t.ItemId)! },
        _ => command with { Actor = actor },
    };

    private static string Describe(EngineCommand command) => command switch
    {
        DeclarePhase d => $"{d.Phase.ToString().ToLowerInvariant()} declared",
        CancelLvp => "LVP cancelled",
        ReleaseHold => "hold released",
        SetForecast f => f.On ? "deterioration forecast set" : "deterioration forecast cleared",
        SetSensorService s => s.InService ? $"{s.SensorId} back in service" : $"{s.SensorId} out of service",
        ConfirmPending => "transition confirmed",
        AcknowledgeAlarm a => $"alarm {a.AlarmKey} acknowledged",
        TickItem t => $"item {t.ItemId} done",
        UntickItem u => $"tick on {u.ItemId} undone",
        _ => "applied",
    };
}
