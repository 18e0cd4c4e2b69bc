using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Units;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Engine;

/// <summary>
/// Per RVR sensor, the accepted RVR values of the last 10 minutes, giving the 1-minute mean and the U/D/N tendency
/// of <see cref="RvrTendencyRule"/> (ICAO Annex 3, App 3, §4.3.6.6). Used by the engine host only (one thread).
/// </summary>
public sealed class RvrTrends(AerodromeProfile profile)
{
    private readonly List<string> _sensors = profile.Sensors.Where(s => s is not null && SensorKinds.GivesRvr(s.Type)).Select(s => s.Id).ToList();
    private readonly Dictionary<string, List<RvrSample>> _samples = new(StringComparer.Ordinal);

    /// <summary>Adds an accepted RVR reading (other kinds are ignored).</summary>
    public void Add(Reading reading)
    {
        if (reading.Kind != ReadingKind.Rvr || !double.IsFinite(reading.Value) || reading.Value < 0)
        {
            return;
        }
        if (!_samples.TryGetValue(reading.SensorId, out var list))
        {
            list = [];
            _samples[reading.SensorId] = list;
        }
        list.Add(new RvrSample(reading.Time, new Metres(reading.Value)));
        var cutoff = reading.Time - RvrAveraging.TenMinutes;
        list.RemoveAll(s => s.Time <= cutoff);
    }

    /// <summary>Every RVR sensor of the profile, in profile order, at <paramref name="now"/>.</summary>
    public IReadOnlyList<SensorTrend> At(DateTimeOffset now) => _sensors.Select(id =>
    {
        if (!_samples.TryGetValue(id, out var list) || list.Count == 0)
        {
            return new SensorTrend(id, null, null);
        }
        var mean = RvrAveraging.OneMinuteMean(list, now)?.Value;
        var tendency = RvrTendencyRule.Assess(list, now) is { } t ? RvrTendencyRule.ToMetarLetter(t).ToString() : null;
        return new SensorTrend(id, mean, tendency);
    }).ToList();
}
