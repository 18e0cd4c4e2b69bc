using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Review;

/// <summary>
/// How early preparation started compared with the first forecast that called for it (docs/review.md "Forecasts"):
/// the instant the forecast flag last turned on by a forecast before the episode started and stayed on until then (or,
/// when it was not on at the start, the first time a forecast turned it on during the episode), that forecast's short
/// form and window, and the episode start (leaving normal: the start of preparation).
/// </summary>
/// <param name="CalledAt">When the forecast turned the flag on.</param>
/// <param name="Source">The forecast group in short form ("TAF 0500–0900 TEMPO 0300 FG VV002").</param>
/// <param name="WindowFrom">When the forecast deterioration was to begin; null if not recorded.</param>
/// <param name="PreparationStart">When preparation started (the episode start).</param>
public sealed record ForecastLead(DateTimeOffset CalledAt, string Source, DateTimeOffset? WindowFrom, DateTimeOffset PreparationStart)
{
    /// <summary>Preparation start minus the call: positive when preparation followed the forecast, negative when it came first.</summary>
    public TimeSpan AfterCall => PreparationStart - CalledAt;

    /// <summary>The forecast window start minus the preparation start: how far ahead of the forecast deterioration preparation began.</summary>
    public TimeSpan? AheadOfWindow => WindowFrom - PreparationStart;

    /// <summary>One line for the summary, e.g. "preparation started 30 s after TAF 0500–0800 … called for it (04:59Z), 2 h 00 min before its window".</summary>
    public string Describe()
    {
        var relation = AfterCall >= TimeSpan.Zero
            ? $"{DisplayFormat.Duration(AfterCall)} after {Source} called for it ({DisplayFormat.UtcClock(CalledAt)})"
            : $"{DisplayFormat.Duration(-AfterCall)} before {Source} called for it ({DisplayFormat.UtcClock(CalledAt)})";
        var window = AheadOfWindow is { } ahead
            ? ahead >= TimeSpan.Zero
                ? $", {DisplayFormat.Duration(ahead)} before its window began ({DisplayFormat.UtcClock(WindowFrom!.Value)})"
                : $", {DisplayFormat.Duration(-ahead)} after its window began ({DisplayFormat.UtcClock(WindowFrom!.Value)})"
            : "";
        return $"preparation started {relation}{window}";
    }

    /// <summary>
    /// The lead for an episode starting at <paramref name="start"/> and ending at <paramref name="end"/> (null while
    /// running), from all recorded events (the call usually comes before the episode); null when no forecast called for it.
    /// </summary>
    public static ForecastLead? Of(IReadOnlyList<RecordedEvent> events, DateTimeOffset start, DateTimeOffset? end)
    {
        ArgumentNullException.ThrowIfNull(events);
        // the flag's run of "on by a forecast" that was going on at the start, if any
        RecordedEvent? onSince = null;
        foreach (var e in events.Where(e => e.Name == "forecast_flag_changed" && e.At <= start).OrderBy(e => e.At))
        {
            if (!IsOnByForecast(e))
            {
                onSince = null;
            }
            else
            {
                onSince ??= e;
            }
        }
        var call = onSince
            ?? events.Where(e => e.Name == "forecast_flag_changed" && e.At > start && (end is null || e.At <= end) && IsOnByForecast(e))
                .OrderBy(e => e.At).FirstOrDefault();
        return call is null ? null : new ForecastLead(call.At, call.Str("source") ?? "a forecast", call.TimeField("window_from"), start);
    }

    private static bool IsOnByForecast(RecordedEvent e)
    {
        using var doc = System.Text.Json.JsonDocument.Parse(e.Json);
        return doc.RootElement.TryGetProperty("on", out var on) && on.ValueKind == System.Text.Json.JsonValueKind.True && e.Str("by") == "forecast";
    }
}
