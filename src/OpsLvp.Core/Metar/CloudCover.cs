namespace OpsLvp.Core.Metar;

/// <summary>Cloud amount of a layer in oktas bands (WMO-No. 306 FM 15).</summary>
public enum CloudCover
{
    /// <summary><c>FEW</c>: 1–2 oktas.</summary>
    Few,
    /// <summary><c>SCT</c>: 3–4 oktas.</summary>
    Scattered,
    /// <summary><c>BKN</c>: 5–7 oktas.</summary>
    Broken,
    /// <summary><c>OVC</c>: 8 oktas.</summary>
    Overcast,
}
