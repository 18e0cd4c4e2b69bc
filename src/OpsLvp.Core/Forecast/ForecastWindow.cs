namespace OpsLvp.Core.Forecast;

/// <summary>
/// When a change group applies. TAF: <c>DDHH/DDHH</c> gives <see cref="From"/> and <see cref="Until"/>, <c>FMDDHHMM</c>
/// only <see cref="From"/>. TREND: <c>FMhhmm</c>, <c>TLhhmm</c>, <c>ATspan</c> each fill their own member; none of them
/// means the whole trend period (WMO-No. 306 FM 15 — from memory).
/// </summary>
public sealed record ForecastWindow(ForecastTime? From, ForecastTime? Until, ForecastTime? At)
{
    public static readonly ForecastWindow Unspecified = new(null, null, null);

    /// <summary>As written in the report: <c>0108/0110</c>, <c>FM011800</c>, <c>FM0700 TL0800</c>, <c>AT0730</c>, or empty.</summary>
    public override string ToString()
    {
        if (From is { Day: not null } f && Until is { Day: not null } u)
        {
            return $"{f.Day:00}{f.Hour:00}/{u.Day:00}{u.Hour:00}";
        }
        var parts = new List<string>();
        if (From is { } from)
        {
            parts.Add($"FM{from}");
        }
        if (Until is { } until)
        {
            parts.Add($"TL{until}");
        }
        if (At is { } at)
        {
            parts.Add($"AT{at}");
        }
        return string.Join(' ', parts);
    }
}
