namespace OpsLvp.Core.Profile;

/// <summary>
/// How a phase's entry thresholds compare (docs/engine.md R18; profile <c>thresholds.&lt;phase&gt;.entryComparison</c>).
/// Recovery is always "at or above recover".
/// </summary>
public enum EntryComparison
{
    /// <summary>The condition holds when the value is strictly below the threshold (default).</summary>
    Below,

    /// <summary>
    /// The condition holds when the value is at or below the threshold: many local instructions say "at or below
    /// 200 ft" (docs/sources.md "LVP phases": the comparison is a local choice). METAR heights come in 100 ft steps, so this is
    /// a whole step: a METAR BKN002 enters a 200 ft threshold at or below, not below.
    /// </summary>
    AtOrBelow,
}
