namespace OpsLvp.Core.Profile;

/// <summary>Runway light intensity per brightness step (cd), and the step in use.</summary>
public sealed record LightsConfig
{
    /// <summary>Brightness step → intensity in candela.</summary>
    public IReadOnlyDictionary<int, double> IntensityCdByStep { get; init; } = new Dictionary<int, double> { [5] = 10_000 };

    /// <summary>The brightness step in use.</summary>
    public int StepInUse { get; init; } = 5;

    /// <summary>Use the continuous E_T formula (option) instead of the four Annex 3 bands (default).</summary>
    public bool ContinuousThreshold { get; init; }
}
