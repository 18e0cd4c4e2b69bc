using OpsLvp.Core.Profile;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// The forecast trigger (docs/forecasts.md): a pure function of the forecasts received, now and the profile's
/// <see cref="ForecastSettings"/> that says whether low visibility is forecast within the look-ahead.
/// </summary>
public static class ForecastTrigger
{
    /// <summary>
    /// Decides the automatic flag.
    /// <list type="number">
    /// <item>Forecasts issued after <paramref name="now"/> are ignored. Of the rest, only the newest TAF (by issue time;
    /// on a tie the later in the list) and the newest TREND are considered: an amended or later TAF replaces the one
    /// before, a <c>CNL</c> TAF replaces it with nothing.</item>
    /// <item>A considered forecast whose validity has ended (<c>ValidUntil ≤ now</c>) counts for nothing.</item>
    /// <item>A part counts when its kind is counted (base, <c>BECMG</c>, <c>FM</c> always; <c>TEMPO</c> when
    /// <see cref="ForecastSettings.CountTempo"/>; <c>PROB30</c>/<c>PROB40</c> when counted, and before <c>TEMPO</c> only
    /// when <c>TEMPO</c> counts too), its visibility is below <see cref="ForecastSettings.VisibilityBelowM"/> (an <c>M</c>
    /// value at or below it) or its ceiling below <see cref="ForecastSettings.CeilingBelowFt"/>, and its window overlaps
    /// [now, now + horizon).</item>
    /// <item>Where the newer of the TAF and the TREND covers an instant, the older one does not speak for it: a part of the
    /// older one counts only for time outside the newer one's validity.</item>
    /// </list>
    /// The flag is on when some part counts; the source is the part whose counted time starts first (list order on a tie).
    /// </summary>
    /// <param name="countVerticalVisibility">Whether vertical visibility counts as ceiling (profile <c>verticalVisibilityIsCeiling</c>).</param>
    public static ForecastTriggerResult Evaluate(
        IEnumerable<ResolvedForecast> forecasts, DateTimeOffset now, ForecastSettings settings, bool countVerticalVisibility = true)
    {
        ArgumentNullException.ThrowIfNull(forecasts);
        ArgumentNullException.ThrowIfNull(settings);
        var received = forecasts.Where(f => f.IssuedAt <= now).ToList();
        var newest = new[] { ForecastOrigin.Taf, ForecastOrigin.Trend }
            .Select(o => received.LastOrDefault(f => f.Origin == o && f.IssuedAt == received.Where(x => x.Origin == o).Max(x => x.IssuedAt)))
            .OfType<ResolvedForecast>()
            .ToList();
        var valid = newest.Where(f => f.ValidUntil > now && !f.Cancelled).ToList();
        if (valid.Count == 0)
        {
            return new ForecastTriggerResult(false, null, newest.Count == 0
                ? "no forecast received"
                : $"no valid forecast: {string.Join("; ", newest.Select(f => $"{Name(f)} {(f.Cancelled ? "cancelled" : $"expired at {f.ValidUntil:ddHHmm}Z")}"))}");
        }

        var horizonEnd = now + TimeSpan.FromMinutes(settings.HorizonMinutes);
        ForecastTriggerSource? first = null;
        var firstStart = DateTimeOffset.MaxValue;
        foreach (var forecast in valid)
        {
            var newer = valid.FirstOrDefault(o => !ReferenceEquals(o, forecast) && o.IssuedAt > forecast.IssuedAt);
            foreach (var part in forecast.Parts)
            {
                if (!Counts(part.Change, settings))
                {
                    continue;
                }
                var visibility = VisibilityBelow(part.Conditions, settings);
                var ceiling = CeilingBelow(part.Conditions, settings, countVerticalVisibility);
                if (visibility is null && ceiling is null)
                {
                    continue;
                }
                var from = Max(part.From, now);
                var until = Min(part.Until, horizonEnd);
                if (newer is not null)
                {
                    // The newer forecast speaks for its own validity; keep the earliest stretch outside it.
                    (from, until) = from < newer.ValidFrom ? (from, Min(until, newer.ValidFrom)) : (Max(from, newer.ValidUntil), until);
                }
                if (from < until && from < firstStart)
                {
                    firstStart = from;
                    first = new ForecastTriggerSource(forecast.Origin, forecast.Station, forecast.Text, part.Group, part.From, part.Until, visibility, ceiling);
                }
            }
        }
        return first is null
            ? new ForecastTriggerResult(false, null,
                $"no counted part of {string.Join(" or ", valid.Select(Name))} forecasts deterioration before {horizonEnd:ddHHmm}Z")
            : new ForecastTriggerResult(true, first, $"{first.ShortForm} from {first.ReportText}");
    }

    /// <summary>Whether parts from <paramref name="change"/> (null: the base forecast) can set the flag under <paramref name="settings"/>.</summary>
    public static bool Counts(ForecastChange? change, ForecastSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        if (change is null)
        {
            return true;
        }
        var probabilityCounts = change.Probability switch
        {
            null => true,
            30 => settings.CountProb30,
            40 => settings.CountProb40,
            _ => false,
        };
        return change.Kind switch
        {
            ForecastChangeKind.Temporary => settings.CountTempo && probabilityCounts,
            ForecastChangeKind.Probability => probabilityCounts,
            ForecastChangeKind.NoSignificantChange => false,
            _ => true,
        };
    }

    private static Metres? VisibilityBelow(ForecastConditions c, ForecastSettings settings)
    {
        if (settings.VisibilityBelowM is not { } limit || c.Cavok || c.Visibility is not { } v || v.Qualifier == Metar.RvrQualifier.Above)
        {
            return null;
        }
        var below = v.Qualifier == Metar.RvrQualifier.Below ? v.Distance.Value <= limit : v.Distance.Value < limit;
        return below ? v.Distance : null;
    }

    private static Feet? CeilingBelow(ForecastConditions c, ForecastSettings settings, bool countVerticalVisibility) =>
        settings.CeilingBelowFt is { } limit && c.FindCeiling(countVerticalVisibility) is { } ceiling && ceiling.Value < limit
            ? ceiling
            : null;

    private static string Name(ResolvedForecast f) => $"{(f.Origin == ForecastOrigin.Taf ? "TAF" : "TREND")} {f.Station} {f.IssuedAt:ddHHmm}Z";

    private static DateTimeOffset Max(DateTimeOffset a, DateTimeOffset b) => a > b ? a : b;

    private static DateTimeOffset Min(DateTimeOffset a, DateTimeOffset b) => a < b ? a : b;
}
