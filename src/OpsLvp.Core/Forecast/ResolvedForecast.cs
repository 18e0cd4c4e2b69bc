namespace OpsLvp.Core.Forecast;

/// <summary>
/// A decoded TAF or TREND placed in absolute time for <see cref="ForecastTrigger"/>: when it was issued, the period it
/// covers (from inclusive, until exclusive) and its parts. Build one with <see cref="FromTaf"/> or <see cref="FromTrend"/>.
/// </summary>
public sealed record ResolvedForecast(
    ForecastOrigin Origin,
    string Station,
    string Text,
    DateTimeOffset IssuedAt,
    DateTimeOffset ValidFrom,
    DateTimeOffset ValidUntil,
    bool Cancelled,
    IReadOnlyList<ForecastPart> Parts)
{
    /// <summary>
    /// Places <paramref name="taf"/> in time: the issue time is the latest such instant not after
    /// <paramref name="receivedAt"/> + 10 min (<see cref="Metar.MetarObservationTime.ResolveNear"/>), the validity start the
    /// instant with that day and hour nearest the issue time, each later time the first at or after the one before.
    /// Prevailing parts: the base forecast from the start; <c>FM</c> ends every earlier prevailing part at its time;
    /// <c>BECMG</c> starts its conditions (applied over the latest prevailing ones) at the start of its window and ends the
    /// earlier ones at its end, since either may hold during the change. <c>TEMPO</c>/<c>PROB</c> parts span their window.
    /// </summary>
    /// <exception cref="ArgumentException">The TAF is NIL: there is no forecast to place.</exception>
    public static ResolvedForecast FromTaf(TafReport taf, DateTimeOffset receivedAt)
    {
        ArgumentNullException.ThrowIfNull(taf);
        if (taf.Nil || taf.Validity is not { From: { } from, Until: { } until })
        {
            throw new ArgumentException("a NIL TAF has no validity period and forecasts nothing", nameof(taf));
        }
        var issued = taf.IssueTime.ResolveNear(receivedAt);
        var validFrom = from.ResolveNear(issued);
        var validUntil = until.ResolveOnOrAfter(validFrom);
        if (taf.Cancelled)
        {
            return new ResolvedForecast(ForecastOrigin.Taf, taf.Station, taf.Text, issued, validFrom, validUntil, true, []);
        }
        var timeline = new Timeline(validUntil);
        timeline.Prevail(null, validFrom, taf.Base);
        foreach (var change in taf.Changes)
        {
            var start = change.Window.From!.Value.ResolveNear(validFrom);
            if (start < validFrom)
            {
                start = change.Window.From.Value.ResolveOnOrAfter(validFrom);
            }
            switch (change.Kind)
            {
                case ForecastChangeKind.From:
                    timeline.Replace(change, start);
                    break;
                case ForecastChangeKind.Becoming:
                    timeline.Become(change, start, change.Window.Until!.Value.ResolveOnOrAfter(start));
                    break;
                default:
                    timeline.Temporary(change, start, change.Window.Until!.Value.ResolveOnOrAfter(start));
                    break;
            }
        }
        return new ResolvedForecast(ForecastOrigin.Taf, taf.Station, taf.Text, issued, validFrom, validUntil, false, timeline.Finish());
    }

    /// <summary>
    /// Places a TREND in time: valid for <see cref="TrendForecast.ValidFor"/> from <paramref name="observedAt"/> (the
    /// METAR/SPECI time). <c>FMhhmm</c>, <c>TLhhmm</c>, <c>AThhmm</c> are the first such times at or after the observation.
    /// <c>BECMG</c> conditions hold from <c>FM</c> or <c>AT</c> (else the observation time) to the end of the period;
    /// <c>TEMPO</c> from <c>FM</c> (else the observation) until <c>TL</c> (else the end). <c>NOSIG</c> forecasts no part.
    /// </summary>
    /// <param name="reportText">The METAR/SPECI text the trend belongs to (the flag's source).</param>
    public static ResolvedForecast FromTrend(TrendForecast trend, string station, string reportText, DateTimeOffset observedAt)
    {
        ArgumentNullException.ThrowIfNull(trend);
        var end = observedAt + TrendForecast.ValidFor;
        var timeline = new Timeline(end);
        foreach (var change in trend.Changes)
        {
            if (change.Kind == ForecastChangeKind.NoSignificantChange)
            {
                continue;
            }
            var window = change.Window;
            var start = Clamp((window.From ?? window.At)?.ResolveNear(observedAt) ?? observedAt, observedAt, end);
            if (change.Kind == ForecastChangeKind.Becoming)
            {
                var until = window.At is not null ? start : Clamp(window.Until?.ResolveOnOrAfter(start) ?? end, start, end);
                timeline.Become(change, start, until);
            }
            else
            {
                timeline.Temporary(change, start, Clamp(window.Until?.ResolveOnOrAfter(start) ?? end, start, end));
            }
        }
        return new ResolvedForecast(ForecastOrigin.Trend, station, reportText, observedAt, observedAt, end, false, timeline.Finish());
    }

    private static DateTimeOffset Clamp(DateTimeOffset t, DateTimeOffset min, DateTimeOffset max) => t < min ? min : t > max ? max : t;

    private sealed class Timeline(DateTimeOffset end)
    {
        private readonly List<ForecastPart> _closed = [];
        private readonly List<(ForecastChange? Change, DateTimeOffset From, ForecastConditions Conditions)> _open = [];
        private readonly DateTimeOffset _end = end;

        public void Prevail(ForecastChange? change, DateTimeOffset from, ForecastConditions conditions) =>
            _open.Add((change, from, conditions));

        public void Replace(ForecastChange change, DateTimeOffset at)
        {
            CloseAll(at);
            Prevail(change, at, change.Conditions);
        }

        public void Become(ForecastChange change, DateTimeOffset from, DateTimeOffset until)
        {
            var before = _open.Count > 0 ? _open[^1].Conditions : new ForecastConditions();
            CloseAll(until);
            Prevail(change, from, change.Conditions.Over(before));
        }

        public void Temporary(ForecastChange change, DateTimeOffset from, DateTimeOffset until) =>
            Add(new ForecastPart(change, from, until < _end ? until : _end, change.Conditions));

        public IReadOnlyList<ForecastPart> Finish()
        {
            CloseAll(_end);
            return _closed.OrderBy(p => p.From).ToList();
        }

        private void CloseAll(DateTimeOffset at)
        {
            foreach (var (change, from, conditions) in _open)
            {
                Add(new ForecastPart(change, from, at < _end ? at : _end, conditions));
            }
            _open.Clear();
        }

        private void Add(ForecastPart part)
        {
            if (part.Until > part.From)
            {
                _closed.Add(part);
            }
        }
    }
}
