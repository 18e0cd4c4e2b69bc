using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// Turns raw forward-scatter (<see cref="ReadingKind.Extinction"/>) and transmissometer
/// (<see cref="ReadingKind.Transmittance"/>) readings into <see cref="ReadingKind.Rvr"/> readings, the same way in
/// the live host and in replays. Deterministic and free of clocks and I/O; it remembers only what it was shown.
/// <list type="bullet">
/// <item>Each raw sample is assessed with <see cref="RvrCalculator"/>: the profile's light intensity at the step in
/// use, the latest background luminance of the sensor's <see cref="SensorConfig.LuminanceSensor"/> (or of any
/// luminance sensor when none is named) that is still fresh (the profile's maximum age for luminance, 120 s
/// without one). With no fresh luminance the threshold that gives the lowest lights range is used
/// (<see cref="RvrInputs.WithUnknownLuminance"/>: the bright-day band, 10⁻³ lx), so a missing luminance can only make
/// RVR lower, never higher, and the derived reading is flagged <see cref="ReadingFlags.LuminanceUnknown"/> when any
/// sample of its 1-minute mean was assessed so (docs/engine.md D1; common practice: fail towards caution).</item>
/// <item>The derived RVR is the 1-minute mean of the sensor's assessed samples ending at the raw reading's time
/// (ICAO Annex 3, App 3, §4.3.5 — from memory), reported on the Annex 3 scale
/// (<see cref="RvrReporting.Report"/>: rounded down, 50 m for "M0050", 2000 m for "P2000").</item>
/// <item>A raw reading that is not ok, out of range, from an unknown sensor or a sensor type that does not
/// produce it yields nothing (the engine rejects the raw reading itself with its reason).</item>
/// </list>
/// </summary>
public sealed class RvrDerivation(AerodromeProfile profile)
{
    private const int DefaultMaxAgeSeconds = 120;

    private readonly Dictionary<string, SensorConfig> _sensors = profile.Sensors
        .Where(s => s is not null && !string.IsNullOrEmpty(s.Id))
        .GroupBy(s => s.Id, StringComparer.Ordinal)
        .ToDictionary(g => g.Key, g => g.First(), StringComparer.Ordinal);

    private readonly Dictionary<string, Reading> _luminance = new(StringComparer.Ordinal);
    private readonly Dictionary<string, List<RvrSample>> _samples = new(StringComparer.Ordinal);

    // Per sensor: times of the samples (still in the 1-minute window) assessed without a fresh luminance.
    private readonly Dictionary<string, List<DateTimeOffset>> _unknownLuminance = new(StringComparer.Ordinal);

    /// <summary>The profile's light intensity at the step in use (10 000 cd when the step has none, the common top step).</summary>
    public Candela LightIntensity { get; } = new(profile.Lights.IntensityCdByStep.TryGetValue(profile.Lights.StepInUse, out var cd) ? cd : 10_000);

    /// <summary>Takes note of <paramref name="reading"/>; returns the RVR reading derived from it (none or one).</summary>
    public IReadOnlyList<Reading> Observe(Reading reading)
    {
        ArgumentNullException.ThrowIfNull(reading);
        if (reading.Status != ReadingStatus.Ok || reading.SensorId is null || !_sensors.TryGetValue(reading.SensorId, out var sensor))
        {
            return [];
        }
        if (reading.Kind == ReadingKind.BackgroundLuminance)
        {
            if (sensor.Type == SensorType.Luminance && double.IsFinite(reading.Value) && reading.Value >= 0
                && (!_luminance.TryGetValue(sensor.Id, out var old) || old.Time < reading.Time))
            {
                _luminance[sensor.Id] = reading;
            }
            return [];
        }
        var inputs = reading.Kind switch
        {
            ReadingKind.Extinction when sensor.Type == SensorType.ForwardScatter && double.IsFinite(reading.Value) && reading.Value > 0 && reading.Value <= 1000 =>
                new RvrInputs { Extinction = ExtinctionCoefficient.FromPerKm(reading.Value), LightIntensity = LightIntensity },
            ReadingKind.Transmittance when sensor.Type == SensorType.Transmissometer && sensor.BaselineM is > 0 && reading.Value > 0 && reading.Value < 1 =>
                new RvrInputs { Transmittance = reading.Value, Baseline = new Metres(sensor.BaselineM.Value), LightIntensity = LightIntensity },
            _ => null,
        };
        if (inputs is null)
        {
            return [];
        }
        var luminance = Luminance(sensor, reading.Time);
        inputs = luminance is { } b
            ? inputs with
            {
                BackgroundLuminance = b,
                ThresholdModel = profile.Lights.ContinuousThreshold ? ThresholdModel.Continuous : ThresholdModel.AnnexBands,
            }
            : inputs.WithUnknownLuminance();
        RvrAssessment assessment;
        try
        {
            assessment = RvrCalculator.Calculate(inputs);
        }
        catch (ArgumentException)
        {
            return [];
        }
        if (!_samples.TryGetValue(sensor.Id, out var samples))
        {
            samples = [];
            _samples[sensor.Id] = samples;
        }
        if (samples.Count > 0 && samples[^1].Time >= reading.Time)
        {
            // out of order or repeated: the engine ignores the raw reading for state, so derive nothing either
            return [];
        }
        samples.Add(new RvrSample(reading.Time, assessment.Rvr));
        samples.RemoveAll(s => s.Time <= reading.Time - RvrAveraging.OneMinute);
        if (!_unknownLuminance.TryGetValue(sensor.Id, out var unknown))
        {
            unknown = [];
            _unknownLuminance[sensor.Id] = unknown;
        }
        if (luminance is null)
        {
            unknown.Add(reading.Time);
        }
        unknown.RemoveAll(t => t <= reading.Time - RvrAveraging.OneMinute);
        var mean = RvrAveraging.OneMinuteMean(samples, reading.Time) ?? assessment.Rvr;
        var flags = unknown.Count > 0 ? ReadingFlags.LuminanceUnknown : ReadingFlags.None;
        return [new Reading(reading.Time, sensor.Id, ReadingKind.Rvr, RvrReporting.Report(mean).Reported.Value, Flags: flags)];
    }

    private CandelaPerSquareMetre? Luminance(SensorConfig sensor, DateTimeOffset at)
    {
        var maxAge = TimeSpan.FromSeconds(profile.MaxAgeSeconds.TryGetValue(ReadingKind.BackgroundLuminance, out var s) && s > 0 ? s : DefaultMaxAgeSeconds);
        Reading? best = null;
        foreach (var (id, r) in _luminance)
        {
            if (sensor.LuminanceSensor is { } named && named != id)
            {
                continue;
            }
            if (r.Time <= at && at < r.Time + maxAge && (best is null || r.Time > best.Time))
            {
                best = r;
            }
        }
        return best is null ? null : new CandelaPerSquareMetre(best.Value);
    }
}
