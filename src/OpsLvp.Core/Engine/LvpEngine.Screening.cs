using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    private sealed partial class Run
    {
        /// <summary>Screens a reading; returns true when it reached the state.</summary>
        public bool Accept(Reading reading, DateTimeOffset now)
        {
            if (Screen(reading, now) is { } rejection)
            {
                Events.Add(new ReadingRejected(now, reading, rejection.Reason, rejection.Detail));
                return false;
            }
            State = State with { Latest = State.Latest.SetItem(_model.Key(reading.SensorId, reading.Kind), reading) };
            return true;
        }

        private (RejectReason Reason, string Detail)? Screen(Reading reading, DateTimeOffset now)
        {
            if (reading is null)
            {
                return (RejectReason.Malformed, "no reading");
            }
            if (reading.SensorId is null || !_model.SensorsById.TryGetValue(reading.SensorId, out var entry))
            {
                return (RejectReason.UnknownSensor, $"sensor '{reading.SensorId}' is not in the profile");
            }
            var sensor = entry.Sensor;
            if (Array.IndexOf(entry.KindsProduced, reading.Kind) < 0)
            {
                return (RejectReason.KindNotProduced, $"a {sensor.Type} sensor does not produce {reading.Kind}");
            }
            if (reading.Status != ReadingStatus.Ok)
            {
                return (RejectReason.StatusNotOk, $"status {reading.Status.ToString().ToLowerInvariant()}");
            }
            if (!ReadingScreen.InRange(reading.Kind, reading.Value))
            {
                var (min, max) = ReadingScreen.Range(reading.Kind);
                return (RejectReason.OutOfRange, $"{Fmt.N(reading.Value)} outside {Fmt.N(min)}..{Fmt.N(max)} for {reading.Kind}");
            }
            var skew = _model.FutureSkew;
            if (reading.Time > now + skew)
            {
                return (RejectReason.FutureDated, $"time {Fmt.Time(reading.Time)} is more than {Fmt.N(skew.TotalSeconds)} s after {Fmt.Time(now)}");
            }
            if (State.Latest.TryGetValue(_model.Key(reading.SensorId, reading.Kind), out var latest))
            {
                if (reading.Time == latest.Time)
                {
                    return (RejectReason.Duplicate, $"{reading.SensorId} {reading.Kind} at {Fmt.Time(reading.Time)} already taken");
                }
                if (reading.Time < latest.Time)
                {
                    return (RejectReason.OlderThanLatest, $"older than the latest {reading.SensorId} {reading.Kind} at {Fmt.Time(latest.Time)}; ignored for state");
                }
            }
            return null;
        }
    }
}
