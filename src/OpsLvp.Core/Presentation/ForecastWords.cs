using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Presentation;

/// <summary>
/// The words every screen uses for the forecast flag (docs/engine.md R26–R29, docs/forecasts.md): what set it, in the
/// short form of the forecast group ("TAF 0500–0900 TEMPO 0300 FG VV002"), or who set it by hand, and when the next
/// look-ahead window begins. Times are UTC through <see cref="DisplayFormat"/>.
/// </summary>
public static class ForecastWords
{
    /// <summary>The first line: "FORECAST ON" / "FORECAST OFF", with "set by hand" for a manual setting.</summary>
    public static string Headline(EngineStatus status)
    {
        ArgumentNullException.ThrowIfNull(status);
        var manual = status.Forecast?.Source is { Manual: true };
        return $"FORECAST {(status.DeteriorationForecast ? "ON" : "OFF")}{(manual ? " — SET BY HAND" : "")}";
    }

    /// <summary>
    /// What decides the flag: the forecast group in short form, a duty manager's setting with the reason, or why no
    /// forecast sets it.
    /// </summary>
    public static string Source(EngineStatus status)
    {
        ArgumentNullException.ThrowIfNull(status);
        var f = status.Forecast;
        return f?.Source switch
        {
            { Manual: true } m => $"{(m.On ? "set" : "cleared")} by {m.Actor} at {DisplayFormat.UtcClock(m.Since)}: {m.Reason}",
            { ShortForm: { } shortForm } => shortForm,
            _ when f is null || !f.Automatic => "set by the duty manager only (no forecast settings in the profile)",
            _ when f.Held.Count == 0 => "no valid forecast received",
            _ => "no deterioration forecast within the look-ahead",
        };
    }

    /// <summary>
    /// When the next look-ahead window begins: while a forecast sets the flag, when its window begins (or that it has
    /// begun); while it is off, when the forecasts held will set it and the group that will; null when there is nothing to say.
    /// </summary>
    public static string? LookAhead(EngineStatus status, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(status);
        var f = status.Forecast;
        if (f?.Source is { Manual: false, From: { } from, Until: { } until })
        {
            return from > now
                ? $"window begins {DisplayFormat.UtcClock(from)}, in {DisplayFormat.Duration(from - now)}"
                : $"window began {DisplayFormat.UtcClock(from)}, ends {DisplayFormat.UtcClock(until)}";
        }
        if (f is { NextOnAt: { } at, NextOnShortForm: { } next })
        {
            return $"next look-ahead from {DisplayFormat.UtcClock(at)}: {next}";
        }
        return null;
    }
}
