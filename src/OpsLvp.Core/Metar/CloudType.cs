namespace OpsLvp.Core.Metar;

/// <summary>The only cloud types a METAR names (WMO-No. 306 FM 15).</summary>
public enum CloudType
{
    /// <summary><c>CB</c>: cumulonimbus.</summary>
    Cumulonimbus,
    /// <summary><c>TCU</c>: towering cumulus.</summary>
    ToweringCumulus,
}
