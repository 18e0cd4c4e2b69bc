using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>The minimum visibility group <c>VVVVDv</c> (e.g. <c>0200NE</c>) of WMO-No. 306 FM 15; direction one of the eight compass points.</summary>
public sealed record MetarMinimumVisibility(Metres Value, string Direction);
