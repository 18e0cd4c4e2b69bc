using OpsLvp.Core.Units;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// What set the forecast flag: the forecast (origin, station, report text), the group that forecasts deterioration,
/// its window (<see cref="From"/> inclusive, <see cref="Until"/> exclusive, the group's whole window, not cut to the
/// look-ahead) and the values that count: visibility and ceiling as forecast (null when the group does not state them
/// or they are not below the values).
/// </summary>
public sealed record ForecastTriggerSource(
    ForecastOrigin Origin,
    string Station,
    string ReportText,
    string Group,
    DateTimeOffset From,
    DateTimeOffset Until,
    Metres? Visibility,
    Feet? Ceiling)
{
    /// <summary>
    /// A short form for screens: origin, window in UTC and the group without its time groups, e.g.
    /// <c>TAF 0500–0900 TEMPO 0300 FG VV002</c>.
    /// </summary>
    public string ShortForm
    {
        get
        {
            var words = Group.Split(' ').Where(w => !IsTimeGroup(w)).Select(w => w.Length == 8 && w.StartsWith("FM", StringComparison.Ordinal) ? "FM" : w);
            return $"{(Origin == ForecastOrigin.Taf ? "TAF" : "TREND")} {From:HHmm}–{Until:HHmm} {string.Join(' ', words)}";
        }
    }

    private static bool IsTimeGroup(string word) =>
        (word.Length == 9 && word[4] == '/' && word.Remove(4, 1).All(char.IsAsciiDigit))
        || (word.Length == 6 && word[..2] is "FM" or "TL" or "AT" && word[2..].All(char.IsAsciiDigit));
}
