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
            if (ReadingScreen.Check(reading, _model.SensorOf(reading.SensorId), now, _model.FutureSkew) is { } stateless)
            {
                return stateless;
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
