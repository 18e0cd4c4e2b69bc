using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>
/// One cloud group <c>NNNhhh[CB|TCU]</c> (WMO-No. 306 FM 15): cover, base in feet above aerodrome level
/// (<c>hhh</c> in hundreds of feet, <c>BKN002</c> = 200 ft). <see cref="Cover"/> is null for <c>///hhh</c>
/// and <see cref="Base"/> null for <c>NNN///</c> (not determinable by an automatic system).
/// </summary>
public sealed record MetarCloudLayer(CloudCover? Cover, Feet? Base, CloudType? Type)
{
    /// <summary>BKN or OVC: covers more than half the sky, so it can form a ceiling.</summary>
    public bool CoversMoreThanHalf => Cover is CloudCover.Broken or CloudCover.Overcast;
}
