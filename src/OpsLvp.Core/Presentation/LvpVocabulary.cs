using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Presentation;

/// <summary>
/// The one table of what each LVP state is called and how it looks, used by every screen and export, so the wall,
/// the console, the tablets, the review pages and the alarm texts say the same words at the same moment. The words
/// are the trade's ("LVP in force", "cancelling LVP", "normal operations": common practice); the wording of the
/// lines, the glyphs and the tones are OpsLvp's own.
/// </summary>
public static class LvpVocabulary
{
    private static readonly StateWords[] s_table =
    [
        new(LvpState.Normal, "Normal operations", "NORMAL OPERATIONS", "no low-visibility measures in place", "○", PhaseTone.Normal, "normal"),
        new(LvpState.Preparation, "LVP preparation", "LVP PREPARATION", "safeguarding the airfield while conditions deteriorate", "△", PhaseTone.Preparation, "preparation"),
        new(LvpState.ConditionsMetSafeguardsIncomplete, "LVP conditions met — safeguards incomplete", "LVP CONDITIONS MET — SAFEGUARDS INCOMPLETE",
            "conditions call for LVP; mandatory safeguards still open", "◭", PhaseTone.Warning, "preparation"),
        new(LvpState.InForce, "LVP in force", "LVP IN FORCE", "low-visibility procedures in force", "■", PhaseTone.Active, "active"),
        new(LvpState.Cancellation, "Cancelling LVP", "CANCELLING LVP", "LVP cancelled, protective measures being withdrawn", "▽", PhaseTone.Cancellation, "cancellation"),
    ];

    /// <summary>Every entry, one per <see cref="LvpState"/>, in severity order.</summary>
    public static IReadOnlyList<StateWords> All => s_table;

    /// <summary>The entry of <paramref name="state"/>; <see cref="ArgumentOutOfRangeException"/> for a value outside the enum.</summary>
    public static StateWords Of(LvpState state) =>
        Array.Find(s_table, w => w.State == state) ?? throw new ArgumentOutOfRangeException(nameof(state), state, "unknown LVP state");

    /// <summary>
    /// What a screen calls the engine's status now: the phase, refined by the engine's own flag (docs/engine.md R13):
    /// preparation held while the active condition is met and mandatory safeguards are open reads "LVP conditions
    /// met — safeguards incomplete". Active is always "LVP in force": the engine enters it only once safeguarded, or
    /// where the profile or a duty manager's audited override says so (the status notes say which).
    /// </summary>
    public static StateWords For(EngineStatus status)
    {
        ArgumentNullException.ThrowIfNull(status);
        return Of(StateOf(status.Phase, status.ConditionsMetSafeguardsIncomplete));
    }

    /// <summary>The state of a phase seen on its own (a past transition, a declared hold).</summary>
    public static StateWords For(Phase phase) => Of(StateOf(phase, conditionsMetSafeguardsIncomplete: false));

    /// <summary>The state of <paramref name="phase"/> given the engine's "conditions met, safeguards incomplete" flag.</summary>
    public static LvpState StateOf(Phase phase, bool conditionsMetSafeguardsIncomplete) => phase switch
    {
        Phase.Normal => LvpState.Normal,
        Phase.Preparation => conditionsMetSafeguardsIncomplete ? LvpState.ConditionsMetSafeguardsIncomplete : LvpState.Preparation,
        Phase.Active => LvpState.InForce,
        Phase.Cancellation => LvpState.Cancellation,
        _ => throw new ArgumentOutOfRangeException(nameof(phase), phase, "unknown phase"),
    };

    /// <summary>A change of phase in running text: "LVP preparation to LVP in force" (never an arrow made of "->").</summary>
    public static string Change(Phase from, Phase to) => $"{For(from).Name} to {For(to).Name}";

    /// <summary>A manual relaxation against the conditions (docs/engine.md R9, R15): "relaxed by j.doe against conditions".</summary>
    public static string RelaxedAgainstConditions(string who) =>
        $"relaxed by {(string.IsNullOrWhiteSpace(who) ? "an unnamed user" : who.Trim())} against conditions";

    /// <summary>The console's button that declares <paramref name="phase"/>: "Declare LVP in force…".</summary>
    public static string DeclareButton(Phase phase) => $"Declare {For(phase).Name}…";
}
