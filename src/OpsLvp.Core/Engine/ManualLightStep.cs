namespace OpsLvp.Core.Engine;

/// <summary>The runway-light step a duty manager set by hand, who set it, why and when (docs/engine.md R20).</summary>
public sealed record ManualLightStep(int Step, string Actor, string Reason, DateTimeOffset At);
