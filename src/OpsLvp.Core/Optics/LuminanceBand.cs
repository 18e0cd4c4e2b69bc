namespace OpsLvp.Core.Optics;

/// <summary>
/// The four background-luminance bands of the Annex 3 illuminance threshold (ICAO Annex 3, Attachment D — from memory).
/// Also used as the "period" a caller may give instead of a measured luminance.
/// </summary>
public enum LuminanceBand
{
    /// <summary>Night: B ≤ 50 cd/m².</summary>
    Night,
    /// <summary>Intermediate (twilight): 50 &lt; B &lt; 1000 cd/m² (Annex 3 writes 51–999).</summary>
    Intermediate,
    /// <summary>Normal day: 1000 ≤ B ≤ 12 000 cd/m².</summary>
    Day,
    /// <summary>Bright day or sunlit fog: B &gt; 12 000 cd/m².</summary>
    BrightDay,
}
