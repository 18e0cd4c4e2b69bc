namespace OpsLvp.Core.Metar;

/// <summary>The text is not a METAR or SPECI that can be decoded (empty, no location indicator, no valid time group).</summary>
public sealed class MetarFormatException(string message) : FormatException(message);
