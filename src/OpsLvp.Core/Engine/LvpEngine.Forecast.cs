using System.Runtime.CompilerServices;
using System.Text.RegularExpressions;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Engine;

/// <summary>Forecasts as engine inputs and the forecast flag (docs/engine.md R25–R29).</summary>
public sealed partial class LvpEngine
{
    /// <summary>Held forecasts placed in time, decoded once per held object (a pure function of its text and receipt).</summary>
    private static readonly ConditionalWeakTable<HeldForecast, ResolvedForecast> ResolvedCache = new();

    /// <summary>
    /// Decodes and places <paramref name="input"/> (docs/engine.md R25): a TAF with <see cref="TafDecoder"/>, a METAR/SPECI's
    /// TREND with <see cref="MetarDecoder"/> and <see cref="TrendDecoder"/>. False with the reason when it cannot be placed
    /// (not decodable, a NIL TAF, a report without TREND).
    /// </summary>
    public static bool TryPlace(ForecastInput input, out ResolvedForecast? forecast, out string? error)
    {
        ArgumentNullException.ThrowIfNull(input);
        forecast = null;
        if (input.Origin == ForecastOrigin.Taf)
        {
            if (!TafDecoder.TryDecode(input.Text, out var taf, out error) || taf is null)
            {
                error = $"TAF not decoded: {error}";
                return false;
            }
            if (taf.Nil)
            {
                error = "NIL TAF: it forecasts nothing, the previous TAF stays";
                return false;
            }
            forecast = ResolvedForecast.FromTaf(taf, input.ReceivedAt);
            return true;
        }
        if (!MetarDecoder.TryDecode(input.Text, out var metar, out error) || metar is null)
        {
            error = $"METAR not decoded: {error}";
            return false;
        }
        if (string.IsNullOrWhiteSpace(metar.Trend))
        {
            error = "the report has no TREND";
            return false;
        }
        try
        {
            var trend = TrendDecoder.Decode(metar.Trend);
            forecast = ResolvedForecast.FromTrend(trend, metar.Station, input.Text.Trim().TrimEnd('=').Trim(), metar.Time.ResolveNear(input.ReceivedAt));
            error = null;
            return true;
        }
        catch (ForecastFormatException ex)
        {
            error = $"TREND not decoded: {ex.Message}";
            return false;
        }
    }

    /// <summary>The held forecast placed in time again; null if it no longer decodes (it always should).</summary>
    internal static ResolvedForecast? Resolve(HeldForecast held) =>
        ResolvedCache.TryGetValue(held, out var cached)
            ? cached
            : TryPlace(new ForecastInput(held.Origin, held.Text, held.ReceivedAt), out var r, out _) && r is not null
                ? ResolvedCache.GetValue(held, _ => r)
                : null;

    internal static List<ResolvedForecast> ResolveAll(EngineState state)
    {
        var list = new List<ResolvedForecast>(state.Forecasts.Count);
        foreach (var held in state.Forecasts)
        {
            if (Resolve(held) is { } r)
            {
                list.Add(r);
            }
        }
        return list;
    }

    /// <summary>The forecast part of <see cref="Describe"/> (docs/engine.md R29); null when no forecast or setting is known.</summary>
    private ForecastStatus? DescribeForecast(EngineState state, DateTimeOffset now)
    {
        var settings = _model.Profile.Forecast;
        if (state.Forecasts.Count == 0 && state.ManualForecast is null && state.ForecastSource is null && settings is null)
        {
            return null;
        }
        var current = state.Forecasts.Where(h => h.ValidUntil > now).ToList();
        (DateTimeOffset At, ForecastTriggerSource Source)? next = null;
        if (settings is not null && state.ManualForecast is null && !state.DeteriorationForecast && current.Count > 0)
        {
            next = ForecastOutlook.NextOn(ResolveAll(state with { Forecasts = [.. current] }), now, settings, _model.Profile.VerticalVisibilityIsCeiling);
        }
        return new ForecastStatus(state.ForecastSource, state.ManualForecast, settings is not null, current,
            next?.At, next?.Source.ShortForm, next?.Source.From);
    }

    [GeneratedRegex("^[A-Z]{4}$")]
    private static partial Regex LocationIndicator();

    private sealed partial class Run
    {
        /// <summary>Accepts a forecast at <paramref name="now"/> (R25), ending a manual setting when it is newer (R27).</summary>
        public void AcceptForecast(ForecastInput input, DateTimeOffset now)
        {
            if (!TryPlace(input, out var placed, out var error) || placed is null)
            {
                Events.Add(new ForecastRejected(now, input.Origin, input.Text, error ?? "not decoded"));
                return;
            }
            var own = _model.Profile.Aerodrome.Id;
            if (LocationIndicator().IsMatch(own) && !string.Equals(placed.Station, own, StringComparison.OrdinalIgnoreCase))
            {
                Events.Add(new ForecastRejected(now, input.Origin, input.Text, $"forecast for {placed.Station}, not for this aerodrome {own}"));
                return;
            }
            foreach (var h in State.Forecasts)
            {
                if (h.Origin == placed.Origin && h.Text == placed.Text)
                {
                    return; // the same report again (a feed polls the same text): nothing new
                }
            }
            if (placed.ValidUntil <= now)
            {
                Events.Add(new ForecastRejected(now, input.Origin, input.Text, $"expired at {Fmt.Time(placed.ValidUntil)}: an expired forecast never counts"));
                return;
            }
            var held = new HeldForecast(placed.Origin, placed.Station, placed.Text, input.ReceivedAt, placed.IssuedAt, placed.ValidFrom, placed.ValidUntil);
            ResolvedCache.AddOrUpdate(held, placed);
            State = State with { Forecasts = State.Forecasts.Add(held) };
            string? note = null;
            if (State.ManualForecast is { } manual && _model.Profile.Forecast is not null && placed.IssuedAt > manual.At)
            {
                State = State with { ManualForecast = null };
                note = $"issued after the manual setting by {manual.Actor} at {Fmt.Time(manual.At)}: the flag follows the forecasts again";
            }
            Events.Add(new ForecastReceived(now, placed.Origin, placed.Station, placed.IssuedAt, placed.ValidFrom, placed.ValidUntil, placed.Text, note));
        }

        /// <summary>
        /// Brings the forecast flag up to date at <paramref name="t"/> (R26–R28): drops expired forecasts, then a manual
        /// setting decides, else the newest valid forecasts through <see cref="ForecastTrigger"/> when the profile has a
        /// <c>forecast</c> section; without one the flag is the duty manager's alone.
        /// </summary>
        private void UpdateForecast(DateTimeOffset t)
        {
            if (State.Forecasts.Count == 0 && State.ManualForecast is null && State.ForecastSource is null)
            {
                return;
            }
            if (State.Forecasts.Any(h => h.ValidUntil <= t))
            {
                State = State with { Forecasts = State.Forecasts.RemoveAll(h => h.ValidUntil <= t) };
            }
            var settings = _model.Profile.Forecast;
            ForecastFlagSource? source;
            string reason;
            if (State.ManualForecast is { } manual)
            {
                source = ForecastFlagSource.FromManual(manual);
                reason = $"{(manual.On ? "set" : "cleared")} by {manual.Actor}: {manual.Reason}";
            }
            else if (settings is null)
            {
                if (State.ForecastSource is not { Manual: true })
                {
                    return;
                }
                source = null;
                reason = "manual setting released; the profile has no forecast section, so no forecast sets the flag";
            }
            else
            {
                var result = ForecastTrigger.Evaluate(ResolveAll(State), t, settings, _model.Profile.VerticalVisibilityIsCeiling);
                source = result.Source is { } s ? ForecastFlagSource.FromTrigger(s, t) : null;
                reason = result.Reason;
            }
            var on = source?.On ?? false;
            if (on == State.DeteriorationForecast && (source is null ? State.ForecastSource is null : source.SameAs(State.ForecastSource)))
            {
                return;
            }
            State = State with { DeteriorationForecast = on, ForecastSource = source };
            Events.Add(new ForecastFlagChanged(t, on, source?.Manual ?? false, source?.Manual == true ? $"set by hand by {source.Actor}" : source?.ShortForm, reason,
                source?.Manual == false ? source.From : null, source?.Manual == false ? source.Until : null));
        }

        /// <summary>Instants in (after, …) at which the automatic flag can change with no input (R28): see <see cref="ForecastOutlook.ChangeInstants"/>.</summary>
        private IEnumerable<DateTimeOffset> ForecastInstants()
        {
            if (State.Forecasts.Count == 0 || _model.Profile.Forecast is not { } settings || State.ManualForecast is not null)
            {
                return [];
            }
            return ForecastOutlook.ChangeInstants(ResolveAll(State), settings);
        }

        private string? SetForecastByHand(SetForecast c, DateTimeOffset now)
        {
            var already = State.ManualForecast is { } m
                ? m.On == c.On
                : _model.Profile.Forecast is null && State.DeteriorationForecast == c.On;
            if (already)
            {
                return $"deterioration forecast is already {(c.On ? "on" : "off")}";
            }
            State = State with { ManualForecast = new ManualForecast(c.On, c.Actor, c.Reason, now) };
            Applied(now, c.Actor, "forecast", $"deterioration forecast {(c.On ? "on" : "off")}", c.Reason);
            UpdateForecast(now);
            return null;
        }

        private string? Release(ReleaseForecast c, DateTimeOffset now)
        {
            if (State.ManualForecast is not { } manual)
            {
                return "no manual forecast setting to release";
            }
            State = State with { ManualForecast = null };
            Applied(now, c.Actor, "release_forecast", $"released the manual forecast setting ({(manual.On ? "on" : "off")}) made by {manual.Actor}", c.Reason);
            UpdateForecast(now);
            return null;
        }
    }
}
