namespace OpsLvp.Core.Engine;

/// <summary>
/// What a command would do if it were sent now (docs/engine.md R40): the engine itself evaluated on a copy of the
/// state, with and without the command, at now and once the longest entry dwell has run. Nothing is recorded and the
/// live state is untouched. Screens say from it what a dangerous command acts against and whether it moves the phase.
/// </summary>
/// <param name="Before">The status now without the command.</param>
/// <param name="After">The status now with the command applied.</param>
/// <param name="Refusal">Why the engine would refuse the command now; null when it would apply.</param>
/// <param name="AgainstConditions">The command relaxes the phase while the recovery condition of the phase it leaves
/// does not hold (docs/engine.md R15): the conditions still call for the phase being left.</param>
/// <param name="RecoveryRvrM">The RVR the phase being left needs to recover (at or above), null when it has none
/// or the command leaves no phase.</param>
/// <param name="RecoveryCeilingFt">The ceiling the phase being left needs to recover (at or above), null likewise.</param>
/// <param name="Dwell">The longest entry dwell of the profile: how far ahead <paramref name="LaterWith"/> and
/// <paramref name="LaterWithout"/> look.</param>
/// <param name="LaterWith">The status after <paramref name="Dwell"/> with the command and no new input.</param>
/// <param name="LaterWithout">The status after <paramref name="Dwell"/> without the command and no new input.</param>
public sealed record CommandPreview(
    EngineStatus Before,
    EngineStatus After,
    string? Refusal,
    bool AgainstConditions,
    double? RecoveryRvrM,
    double? RecoveryCeilingFt,
    TimeSpan Dwell,
    EngineStatus LaterWith,
    EngineStatus LaterWithout);
