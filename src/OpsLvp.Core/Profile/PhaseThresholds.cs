namespace OpsLvp.Core.Profile;

/// <summary>
/// Entry and recovery thresholds of one phase (docs/engine.md R4, R5, R7). A null RVR or ceiling pair leaves that
/// input out of the phase's conditions. Entry is strict (value &lt; below) unless <see cref="EntryComparison"/> says
/// at or below (docs/engine.md R18); recovery is inclusive (value ≥ recover).
/// </summary>
public sealed record PhaseThresholds
{
    public double? RvrBelowM { get; init; }
    public double? RvrRecoverM { get; init; }
    public double? CeilingBelowFt { get; init; }
    public double? CeilingRecoverFt { get; init; }

    /// <summary>How the entry thresholds compare: <see cref="EntryComparison.Below"/> (default) or <see cref="EntryComparison.AtOrBelow"/>.</summary>
    public EntryComparison EntryComparison { get; init; } = EntryComparison.Below;

    /// <summary>Whether <paramref name="value"/> meets an entry threshold of this phase; an unknown value or threshold never does.</summary>
    public bool Enters(double? value, double? threshold) =>
        value is { } v && threshold is { } limit && (EntryComparison == EntryComparison.AtOrBelow ? v <= limit : v < limit);

    /// <summary>The entry comparison as reasons write it: <c>&lt;</c> or <c>&lt;=</c>.</summary>
    public string EntrySign => EntryComparison == EntryComparison.AtOrBelow ? "<=" : "<";

    /// <summary>How long the entry condition must hold before escalation, seconds (≥ 0).</summary>
    public int EnterDwellSeconds { get; init; }

    /// <summary>How long the recovery condition must hold before relaxation, seconds (&gt; 0).</summary>
    public int RecoverDwellSeconds { get; init; }
}
