using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Commands;

/// <summary>
/// <see cref="ILvpCommandService"/>: role check (<see cref="CommandAuthorizer"/>), input validation, then the engine
/// host's single evaluation path, which commits the audit entries with the new state before applying and publishing.
/// </summary>
public sealed class LvpCommandService(LiveEngineHost host, ILogger<LvpCommandService> logger) : ILvpCommandService
{
    /// <summary>Told to the user when the audit entry could not be committed (docs/engine.md R12).</summary>
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
        var named = WithActor(command, caller.Name, profile);
        if (Validate(named, profile) is { } invalid)
        {
            return new CommandOutcome(CommandOutcomeKind.Refused, invalid);
        }
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

    /// <summary>
    /// Null when the input is complete and names known things; else what is wrong, in the engine's words
    /// (<see cref="CommandPreconditions"/>, the one place these rules live).
    /// </summary>
    public static string? Validate(EngineCommand command, AerodromeProfile profile) => CommandPreconditions.Check(command, profile);

    private static EngineCommand WithActor(EngineCommand command, string actor, AerodromeProfile profile) => command switch
    {
        // a tick without a team is for the item's own team
        TickItem t when string.IsNullOrWhiteSpace(t.Team) => t with { Actor = actor, Team = CommandAuthorizer.ItemTeam(profile, t.ItemId)! },
        _ => command with { Actor = actor },
    };

    private static string Describe(EngineCommand command) => command switch
    {
        DeclarePhase { SafeguardsOverride: not null } d => $"{LvpVocabulary.For(d.Phase).Name} declared over open safeguards",
        DeclarePhase d => $"{LvpVocabulary.For(d.Phase).Name} declared",
        CancelLvp => "LVP cancelled",
        ReleaseHold => "hold released",
        SetForecast f => f.On ? "deterioration forecast set" : "deterioration forecast cleared",
        ReleaseForecast => "manual forecast setting released",
        SetSensorService s => s.InService ? $"{s.SensorId} back in service" : $"{s.SensorId} out of service",
        SetLightStep l => l.Step == 0 ? "light step 0 (lights off) set" : $"light step {l.Step} set",
        ConfirmPending => "transition confirmed",
        AcknowledgeAlarm a => $"alarm {a.AlarmKey} acknowledged",
        TickItem t => $"item {t.ItemId} done",
        UntickItem u => $"tick on {u.ItemId} undone",
        MarkNotApplicable n => $"item {n.ItemId} marked not applicable",
        _ => "applied",
    };
}
