namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    /// <summary>
    /// What <paramref name="command"/> would do at <paramref name="now"/> (docs/engine.md R40): the same evaluation as a
    /// live command, run on <paramref name="state"/> (immutable, so the caller's state is untouched), compared with the
    /// evaluation without it. Nothing is recorded; the events are dropped.
    /// </summary>
    public CommandPreview Preview(EngineState state, EngineCommand command, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(command);
        var without = Evaluate(state, [], now);
        now = without.State.EvaluatedAt;
        var with = Evaluate(without.State, [command], now);
        var refusal = with.Events.OfType<CommandRefused>().FirstOrDefault(r => ReferenceEquals(r.Command, command))?.Reason;
        var relaxation = with.State.RelaxedAgainstConditions;
        var against = refusal is null && relaxation is not null && relaxation.At == now
            && !ReferenceEquals(relaxation, without.State.RelaxedAgainstConditions);
        // the phase a cancel leaves, and its recovery limits as the conditions read them (recover, else the entry threshold; R5)
        var leaving = command is CancelLvp && refusal is null ? without.State.Phase : (Phase?)null;
        var limits = leaving switch
        {
            Phase.Active => Profile.Thresholds.Active,
            Phase.Preparation => Profile.Thresholds.Preparation,
            _ => null,
        };
        var dwell = TimeSpan.FromSeconds(Math.Max(Profile.Thresholds.Preparation.EnterDwellSeconds, Profile.Thresholds.Active.EnterDwellSeconds));
        var later = now + dwell;
        return new CommandPreview(
            Describe(without.State, now),
            Describe(with.State, now),
            refusal,
            against,
            limits is null ? null : limits.RvrRecoverM ?? limits.RvrBelowM,
            limits is null ? null : limits.CeilingRecoverFt ?? limits.CeilingBelowFt,
            dwell,
            Describe(Evaluate(with.State, [], later).State, later),
            Describe(Evaluate(without.State, [], later).State, later));
    }
}
