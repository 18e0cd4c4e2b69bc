namespace OpsLvp.Core.Optics;

/// <summary>How the illuminance threshold E_T follows from the background luminance.</summary>
public enum ThresholdModel
{
    /// <summary>The four Annex 3 bands (default; ICAO Annex 3, Attachment D — from memory).</summary>
    AnnexBands,
    /// <summary>
    /// The continuous form log₁₀E_T = 0.05(log₁₀B)² + 0.573·log₁₀B − 6.667, recalled for ICAO Doc 9328 but unconfirmed
    /// (docs/sources.md "Optics"): an option only.
    /// </summary>
    Continuous,
}
