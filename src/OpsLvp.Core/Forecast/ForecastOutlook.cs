using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// When the forecasts held will next set the flag if nothing new arrives (docs/engine.md R29): the flag is a step
/// function of time whose value can change only where now or now + horizon crosses a forecast's issue, validity or
/// part boundary, so trying those instants in order finds the next turn on. The look-ahead [now, now + horizon) is
/// half-open, so a part starting at b is inside it only after b − horizon: the engine, which evaluates to the second
/// (docs/engine.md R7), sees it enter at b − horizon + 1 s.
/// </summary>
public static class ForecastOutlook
{
    /// <summary>The engine's time resolution for instants that have no exact first moment (docs/engine.md R7).</summary>
    public static readonly TimeSpan Resolution = TimeSpan.FromSeconds(1);

    /// <summary>Every instant after which <see cref="ForecastTrigger.Evaluate"/> can give another result, ascending and distinct.</summary>
    public static IReadOnlyList<DateTimeOffset> ChangeInstants(IEnumerable<ResolvedForecast> forecasts, ForecastSettings settings)
    {
        ArgumentNullException.ThrowIfNull(forecasts);
        ArgumentNullException.ThrowIfNull(settings);
        var horizon = TimeSpan.FromMinutes(settings.HorizonMinutes);
        var set = new SortedSet<DateTimeOffset>();
        foreach (var f in forecasts)
        {
            foreach (var b in Boundaries(f))
            {
                set.Add(b);
                set.Add(b - horizon);
                set.Add(b - horizon + Resolution);
            }
        }
        return set.ToList();
    }

    /// <summary>
    /// The first instant after <paramref name="now"/> at which the forecasts would set the flag, with the source then;
    /// null when they never will (or the flag is already on at <paramref name="now"/>).
    /// </summary>
    public static (DateTimeOffset At, ForecastTriggerSource Source)? NextOn(
        IReadOnlyList<ResolvedForecast> forecasts, DateTimeOffset now, ForecastSettings settings, bool countVerticalVisibility = true)
    {
        ArgumentNullException.ThrowIfNull(forecasts);
        ArgumentNullException.ThrowIfNull(settings);
        if (ForecastTrigger.Evaluate(forecasts, now, settings, countVerticalVisibility).On)
        {
            return null;
        }
        foreach (var t in ChangeInstants(forecasts, settings))
        {
            if (t <= now)
            {
                continue;
            }
            if (ForecastTrigger.Evaluate(forecasts, t, settings, countVerticalVisibility) is { On: true, Source: { } source })
            {
                return (t, source);
            }
        }
        return null;
    }

    private static IEnumerable<DateTimeOffset> Boundaries(ResolvedForecast f)
    {
        yield return f.IssuedAt;
        yield return f.ValidFrom;
        yield return f.ValidUntil;
        foreach (var p in f.Parts)
        {
            yield return p.From;
            yield return p.Until;
        }
    }
}
