using OpsLvp.Core.Reporting;
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
    /// <item>Forecasts issued after <paramref name="now"/> are ignored, and so is every part of a forecast whose
    /// validity has ended (<c>ValidUntil ≤ now</c>): an expired forecast never counts.</item>
    /// <item>For each instant, the newest forecast (by issue time; on a tie the later in the list) whose validity covers
    /// it speaks for it, TAF or TREND alike: an amended or later TAF replaces the one before over its validity, a
    /// <c>CNL</c> TAF replaces it with nothing, a newer TREND speaks for its two hours.</item>
    /// <item>A part counts when its kind is counted (base, <c>BECMG</c>, <c>FM</c> always; <c>TEMPO</c> when
    /// <see cref="ForecastSettings.CountTempo"/>; <c>PROB30</c>/<c>PROB40</c> when counted, and before <c>TEMPO</c> only
    /// when <c>TEMPO</c> counts too), its visibility is below <see cref="ForecastSettings.VisibilityBelowM"/> (an <c>M</c>
    /// value at or below it) or its ceiling below <see cref="ForecastSettings.CeilingBelowFt"/>, and some instant of its
    /// window within [now, now + horizon) is one its forecast speaks for.</item>
    /// </list>
    /// The flag is on when some part counts; the source is the part whose counted time starts first (list order on a tie).
    /// Pass only the aerodrome's own forecasts: a forecast for another station would speak over them.
    /// </summary>
    /// <param name="countVerticalVisibility">Whether vertical visibility counts as ceiling (profile <c>verticalVisibilityIsCeiling</c>).</param>
    public static ForecastTriggerResult Evaluate(
        IEnumerable<ResolvedForecast> forecasts, DateTimeOffset now, ForecastSettings settings, bool countVerticalVisibility = true)
    {
        ArgumentNullException.ThrowIfNull(forecasts);
        ArgumentNullException.ThrowIfNull(settings);
        // Oldest first; a stable sort keeps list order on equal issue times, so the later entry counts as newer.
        var received = forecasts.Where(f => f.IssuedAt <= now).OrderBy(f => f.IssuedAt).ToList();
        var current = received.Where(f => f.ValidUntil > now).ToList();
        if (current.Count == 0)
        {
            return new ForecastTriggerResult(false, null, received.Count == 0
                ? "no forecast received"
                : $"no valid forecast: the newest, {Name(received[^1])}, expired at {received[^1].ValidUntil:ddHHmm}Z");
        }

        var horizonEnd = now + TimeSpan.FromMinutes(settings.HorizonMinutes);
        ForecastTriggerSource? first = null;
        var firstStart = DateTimeOffset.MaxValue;
        for (var i = 0; i < current.Count; i++)
        {
            var forecast = current[i];
            var newer = current.Skip(i + 1).ToList();
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
                if (FirstSpokenInstant(Max(part.From, now), Min(part.Until, horizonEnd), newer) is { } from && from < firstStart)
                {
                    firstStart = from;
                    first = new ForecastTriggerSource(forecast.Origin, forecast.Station, forecast.Text, part.Group, part.From, part.Until, visibility, ceiling);
                }
            }
        }
        return first is null
            ? new ForecastTriggerResult(false, null,
                $"no counted part of the newest forecasts ({string.Join(", ", current.Select(f => Name(f) + (f.Cancelled ? " cancelled" : "")))}) forecasts deterioration before {horizonEnd:ddHHmm}Z")
            : new ForecastTriggerResult(true, first, $"{first.ShortForm} from {first.ReportText}");
    }

    /// <summary>The first instant of [from, until) that no newer forecast's validity covers, or null.</summary>
    private static DateTimeOffset? FirstSpokenInstant(DateTimeOffset from, DateTimeOffset until, IReadOnlyList<ResolvedForecast> newer)
    {
        var pieces = new List<(DateTimeOffset From, DateTimeOffset Until)>();
        if (from < until)
        {
            pieces.Add((from, until));
        }
        foreach (var n in newer)
        {
            pieces = pieces.SelectMany(p => new[] { (p.From, Min(p.Until, n.ValidFrom)), (Max(p.From, n.ValidUntil), p.Until) })
                .Where(p => p.Item1 < p.Item2)
                .ToList();
        }
        return pieces.Count == 0 ? null : pieces.Min(p => p.From);
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
        if (settings.VisibilityBelowM is not { } limit || c.Cavok || c.Visibility is not { } v || v.Qualifier == RvrQualifier.Above)
        {
            return null;
        }
        var below = v.Qualifier == RvrQualifier.Below ? v.Distance.Value <= limit : v.Distance.Value < limit;
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
