using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>
/// The physical ranges the engine screens readings against (docs/engine.md R1; the kinds each sensor type
/// produces are in <see cref="SensorKinds"/>). Ranges are
/// inclusive, chosen wide enough for any real instrument and narrow enough to catch unit and parsing errors
/// (common practice, not from a standard): RVR 0–10 000 m, visibility 0–100 000 m, cloud base and vertical
/// visibility 0–50 000 ft, extinction 0–1000 per km, transmittance 0–1, background luminance 0–100 000 cd/m²,
/// light step 0–100.
/// NaN and infinities are always out of range.
/// </summary>
public static class ReadingScreen
{
    /// <summary>
    /// The checks of one reading that need no earlier reading, in the engine's order (docs/engine.md R1): unknown
    /// sensor (<paramref name="sensor"/> is null), a kind the sensor type does not produce, a status other than ok,
    /// a value outside the kind's range, a time more than <paramref name="futureSkew"/> after <paramref name="now"/>.
    /// Null when the reading passes. Duplicate and older-than-latest need the engine state and are the engine's.
    /// The engine screens with this function and the push ingest answers with it, so both give the same reason.
    /// </summary>
    public static (RejectReason Reason, string Detail)? Check(Reading reading, SensorConfig? sensor, DateTimeOffset now, TimeSpan futureSkew)
    {
        ArgumentNullException.ThrowIfNull(reading);
        if (sensor is null)
        {
            return (RejectReason.UnknownSensor, $"sensor '{reading.SensorId}' is not in the profile");
        }
        if (!Produces(sensor.Type, reading.Kind))
        {
            return (RejectReason.KindNotProduced, $"a {sensor.Type} sensor does not produce {reading.Kind}");
        }
        if (reading.Status != ReadingStatus.Ok)
        {
            return (RejectReason.StatusNotOk, $"status {reading.Status.ToString().ToLowerInvariant()}");
        }
        if (!InRange(reading.Kind, reading.Value))
        {
            var (min, max) = Range(reading.Kind);
            return (RejectReason.OutOfRange, $"{Fmt.N(reading.Value)} outside {Fmt.N(min)}..{Fmt.N(max)} for {reading.Kind}");
        }
        if (reading.Time > now + futureSkew)
        {
            return (RejectReason.FutureDated, $"time {Fmt.Time(reading.Time)} is more than {Fmt.N(futureSkew.TotalSeconds)} s after {Fmt.Time(now)}");
        }
        return null;
    }

    /// <summary>
    /// <see cref="Check(Reading, SensorConfig?, DateTimeOffset, TimeSpan)"/> against a profile: the first sensor with
    /// the reading's id and the profile's future skew (negative counts as zero).
    /// </summary>
    public static (RejectReason Reason, string Detail)? Check(Reading reading, AerodromeProfile profile, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(reading);
        ArgumentNullException.ThrowIfNull(profile);
        var sensor = profile.Sensors.FirstOrDefault(s => s is not null && string.Equals(s.Id, reading.SensorId, StringComparison.Ordinal));
        return Check(reading, sensor, now, TimeSpan.FromSeconds(Math.Max(0, profile.FutureSkewSeconds)));
    }

    /// <summary>Whether a sensor of <paramref name="type"/> sends readings of <paramref name="kind"/> (<see cref="SensorKinds.Produced"/>).</summary>
    public static bool Produces(SensorType type, ReadingKind kind) => SensorKinds.Produced(type).Contains(kind);

    /// <summary>Inclusive physical range of a kind, in its unit.</summary>
    public static (double Min, double Max) Range(ReadingKind kind) => kind switch
    {
        ReadingKind.Rvr => (0, 10_000),
        ReadingKind.Visibility => (0, 100_000),
        ReadingKind.CloudBase => (0, 50_000),
        ReadingKind.VerticalVisibility => (0, 50_000),
        ReadingKind.Extinction => (0, 1_000),
        ReadingKind.Transmittance => (0, 1),
        ReadingKind.BackgroundLuminance => (0, 100_000),
        ReadingKind.LightStep => (0, 100),
        _ => (double.NaN, double.NaN),
    };

    /// <summary>True when <paramref name="value"/> is finite and inside the kind's range.</summary>
    public static bool InRange(ReadingKind kind, double value)
    {
        var (min, max) = Range(kind);
        return double.IsFinite(value) && value >= min && value <= max;
    }
}
