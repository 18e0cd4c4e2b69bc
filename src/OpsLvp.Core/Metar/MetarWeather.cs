namespace OpsLvp.Core.Metar;

/// <summary>
/// One present (or recent) weather group <c>[+|-|VC][descriptor]phenomena</c> (WMO-No. 306 FM 15, code table 4678).
/// <see cref="Code"/> is the group as written without any <c>RE</c> prefix (e.g. <c>-RA</c>, <c>FZFG</c>, <c>VCFG</c>).
/// </summary>
public sealed record MetarWeather(string? Intensity, string? Descriptor, IReadOnlyList<string> Phenomena, string Code);
