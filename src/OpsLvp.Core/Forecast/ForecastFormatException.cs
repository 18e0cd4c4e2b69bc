namespace OpsLvp.Core.Forecast;

/// <summary>The text is not a TAF (or TREND) that can be decoded; the message says what was expected.</summary>
public sealed class ForecastFormatException(string message) : FormatException(message);
