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
/// <item>Each raw sample is assessed with <see cref="RvrCalculator"/>: the light intensity of the step in use
/// (<see cref="IntensityAt"/>, docs/engine.md R20), the latest background luminance of the sensor's <see cref="SensorConfig.LuminanceSensor"/> (or of any
/// luminance sensor when none is named) that is still fresh (the profile's maximum age for luminance, 120 s
/// without one). With no fresh luminance the threshold that gives the lowest lights range is used
/// (<see cref="RvrInputs.WithUnknownLuminance"/>: the bright-day band, 10⁻³ lx), so a missing luminance can only make
/// RVR lower, never higher, and the derived reading is flagged <see cref="ReadingFlags.LuminanceUnknown"/> when any
/// sample of its 1-minute mean was assessed so (docs/engine.md R19; common practice: fail towards caution).</item>
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

    // Per sensor: the fallback flags of the samples still in the 1-minute window (R19, R20).
    private readonly Dictionary<string, List<(DateTimeOffset Time, ReadingFlags Flags)>> _sampleFlags = new(StringComparer.Ordinal);

    // Latest light-step reading per lighting sensor (R20).
    private readonly Dictionary<string, Reading> _steps = new(StringComparer.Ordinal);

    private readonly bool _hasLighting = profile.Sensors.Any(s => s is not null && s.Type == SensorType.Lighting);

    /// <summary>The profile's light intensity at its starting step <c>stepInUse</c> (10 000 cd when the profile has no intensities, the common top step).</summary>
    public Candela LightIntensity { get; } = new(profile.Lights.IntensityCdByStep.TryGetValue(profile.Lights.StepInUse, out var cd) ? cd : 10_000);

    /// <summary>
    /// The step a duty manager set by hand (docs/engine.md R20), from the engine state: the live host and the replay
    /// runner set it from the state before each evaluation, so both derive with the same setting.
    /// </summary>
    public Engine.ManualLightStep? ManualStep { get; set; }

    /// <summary>
    /// The runway-light step in use at <paramref name="at"/> (docs/engine.md R20). The newest of the duty manager's
    /// setting (<see cref="ManualStep"/>, from its instant on) and the lighting sensors' <see cref="ReadingKind.LightStep"/>
    /// readings wins: a setting made after the latest lighting reading stands until a newer reading arrives (a
    /// setting does not go stale); otherwise the step of the latest fresh lighting reading, or the profile's
    /// <c>stepInUse</c> while neither exists (its starting value). A lighting sensor whose last reading went stale
    /// gives an unknown step (null).
    /// </summary>
    public LightStepInUse StepInUse(DateTimeOffset at)
    {
        Reading? latest = null;
        Reading? fresh = null;
        if (_hasLighting)
        {
            foreach (var (id, r) in _steps)
            {
                if (r.Time > at)
                {
                    continue;
                }
                if (latest is null || r.Time > latest.Time)
                {
                    latest = r;
                }
                if (at < r.Time + MaxAge(id, ReadingKind.LightStep) && (fresh is null || r.Time > fresh.Time))
                {
                    fresh = r;
                }
            }
        }
        double? step;
        LightStepInUse use;
        if (ManualStep is { } manual && manual.At <= at && (latest is null || manual.At >= latest.Time))
        {
            step = manual.Step;
            use = new LightStepInUse(step, LightStepOrigin.Manual, manual.Actor, manual.At, false);
        }
        else if (_hasLighting && _steps.Count > 0)
        {
            step = fresh?.Value;
            use = new LightStepInUse(step, LightStepOrigin.Sensor, (fresh ?? latest)?.SensorId, (fresh ?? latest)?.Time, false);
        }
        else
        {
            step = profile.Lights.StepInUse;
            use = new LightStepInUse(step, LightStepOrigin.Profile, null, null, false);
        }
        var known = step is 0
            || (step is { } s && s == Math.Floor(s) && s <= int.MaxValue && profile.Lights.IntensityCdByStep.ContainsKey((int)s))
            || profile.Lights.IntensityCdByStep.Count == 0;
        return known ? use : use with { Unknown = true };
    }

    /// <summary>
    /// The runway-light intensity in use at <paramref name="at"/> (docs/engine.md R20): that of <see cref="StepInUse"/>.
    /// Step 0 is lights off: 0 cd, so RVR = MOR (ICAO Annex 3, App 3, §4.3.5 — from memory). A step the profile has
    /// no intensity for, a step that is not a whole number, or a lighting sensor whose last reading went stale is
    /// unknown: the lowest configured intensity is used (a lower intensity can only shorten Allard's range; common
    /// practice) and <paramref name="unknown"/> is true.
    /// </summary>
    public Candela IntensityAt(DateTimeOffset at, out bool unknown)
    {
        var use = StepInUse(at);
        unknown = false;
        if (use.Step is 0)
        {
            return new Candela(0);
        }
        if (use.Step is { } s && s == Math.Floor(s) && s <= int.MaxValue && profile.Lights.IntensityCdByStep.TryGetValue((int)s, out var cd))
        {
            return new Candela(cd);
        }
        if (profile.Lights.IntensityCdByStep.Count == 0)
        {
            return LightIntensity;
        }
        unknown = true;
        return new Candela(profile.Lights.IntensityCdByStep.Values.Min());
    }

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
        if (reading.Kind == ReadingKind.LightStep)
        {
            if (sensor.Type == SensorType.Lighting && double.IsFinite(reading.Value) && reading.Value >= 0
                && (!_steps.TryGetValue(sensor.Id, out var old) || old.Time < reading.Time))
            {
                _steps[sensor.Id] = reading;
            }
            return [];
        }
        var intensity = IntensityAt(reading.Time, out var stepUnknown);
        var inputs = reading.Kind switch
        {
            ReadingKind.Extinction when sensor.Type == SensorType.ForwardScatter && double.IsFinite(reading.Value) && reading.Value > 0 && reading.Value <= 1000 =>
                new RvrInputs { Extinction = ExtinctionCoefficient.FromPerKm(reading.Value), LightIntensity = intensity },
            ReadingKind.Transmittance when sensor.Type == SensorType.Transmissometer && sensor.BaselineM is > 0 && reading.Value > 0 && reading.Value < 1 =>
                new RvrInputs { Transmittance = reading.Value, Baseline = new Metres(sensor.BaselineM.Value), LightIntensity = intensity },
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
        if (!_sampleFlags.TryGetValue(sensor.Id, out var sampleFlags))
        {
            sampleFlags = [];
            _sampleFlags[sensor.Id] = sampleFlags;
        }
        var fallbacks = (luminance is null ? ReadingFlags.LuminanceUnknown : ReadingFlags.None)
            | (stepUnknown ? ReadingFlags.LightStepUnknown : ReadingFlags.None);
        if (fallbacks != ReadingFlags.None)
        {
            sampleFlags.Add((reading.Time, fallbacks));
        }
        sampleFlags.RemoveAll(f => f.Time <= reading.Time - RvrAveraging.OneMinute);
        var mean = RvrAveraging.OneMinuteMean(samples, reading.Time) ?? assessment.Rvr;
        var flags = sampleFlags.Aggregate(ReadingFlags.None, (all, f) => all | f.Flags);
        return [new Reading(reading.Time, sensor.Id, ReadingKind.Rvr, RvrReporting.Report(mean).Reported.Value, Flags: flags)];
    }

    private CandelaPerSquareMetre? Luminance(SensorConfig sensor, DateTimeOffset at)
    {
        Reading? best = null;
        foreach (var (id, r) in _luminance)
        {
            if (sensor.LuminanceSensor is { } named && named != id)
            {
                continue;
            }
            var maxAge = MaxAge(id, ReadingKind.BackgroundLuminance);
            if (r.Time <= at && at < r.Time + maxAge && (best is null || r.Time > best.Time))
            {
                best = r;
            }
        }
        return best is null ? null : new CandelaPerSquareMetre(best.Value);
    }

    /// <summary>A sensor's own maximum age when set, else the kind's, else 120 s (docs/engine.md R2, R21).</summary>
    private TimeSpan MaxAge(string sensorId, ReadingKind kind) =>
        _sensors.TryGetValue(sensorId, out var sensor) && sensor.MaxAgeSeconds is { } own && own > 0
            ? TimeSpan.FromSeconds(own)
            : TimeSpan.FromSeconds(profile.MaxAgeSeconds.TryGetValue(kind, out var s) && s > 0 ? s : DefaultMaxAgeSeconds);
}
