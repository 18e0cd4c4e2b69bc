namespace OpsLvp.Core.Profile;

/// <summary>
/// Entry and recovery thresholds of one phase (docs/engine.md R4, R5, R7). A null RVR or ceiling pair leaves that
/// input out of the phase's conditions. Entry is strict (value &lt; below); recovery is inclusive (value ≥ recover).
/// </summary>
public sealed record PhaseThresholds
{
    public double? RvrBelowM { get; init; }
    public double? RvrRecoverM { get; init; }
    public double? CeilingBelowFt { get; init; }
    public double? CeilingRecoverFt { get; init; }

    /// <summary>How long the entry condition must hold before escalation, seconds (≥ 0).</summary>
    public int EnterDwellSeconds { get; init; }

    /// <summary>How long the recovery condition must hold before relaxation, seconds (&gt; 0).</summary>
    public int RecoverDwellSeconds { get; init; }
}
