using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    /// <summary>One evaluation: the state being built and the events so far.</summary>
    private sealed partial class Run(EngineModel model, EngineState state)
    {
        private readonly EngineModel _model = model;

        public EngineState State { get; set; } = state;

        public List<EngineEvent> Events { get; } = [];

        private ThresholdSet Thresholds => _model.Profile.Thresholds;

        // The last state a step left unchanged, and its instant: stepping it again there is a no-op.
        private EngineState? _settledState;
        private DateTimeOffset _settledAt;

        /// <summary>Marks the current state as one a step at <paramref name="t"/> leaves unchanged.</summary>
        public void Settled(DateTimeOffset t)
        {
            _settledState = State;
            _settledAt = t;
        }

        /// <summary>Whether a step at <paramref name="t"/> is known to leave the current state unchanged.</summary>
        public bool IsSettled(DateTimeOffset t) => ReferenceEquals(State, _settledState) && _settledAt == t;

        /// <summary>The earliest instant in (after, until] at which something can change without an input.</summary>
        public DateTimeOffset? NextCriticalInstant(DateTimeOffset after, DateTimeOffset until)
        {
            DateTimeOffset? best = null;
            void Consider(DateTimeOffset c)
            {
                if (c > after && c <= until && (best is null || c < best))
                {
                    best = c;
                }
            }
            foreach (var r in State.Latest.Values)
            {
                Consider(r.Time + _model.MaxAge(r.SensorId, r.Kind));
            }
            foreach (var sensor in _model.SensorEntries)
            {
                if (!HasReadings(sensor))
                {
                    Consider(MonitoringSince + sensor.PrimaryMaxAge);
                }
            }
            foreach (var (kind, since) in State.HoldingSince)
            {
                Consider(DwellStart(kind, since) + _model.Dwell(kind));
            }
            foreach (var instant in ForecastInstants())
            {
                Consider(instant);
            }
            foreach (var item in State.Items)
            {
                if (item.Status == ItemStatus.Open)
                {
                    Consider(item.DueAt);
                }
            }
            ConsiderCapability(Consider);
            return best;
        }

        private DateTimeOffset MonitoringSince => State.MonitoringSince ?? State.PhaseSince;

        private bool HasReadings(EngineModel.SensorEntry sensor)
        {
            foreach (var key in sensor.AllKeys)
            {
                if (State.Latest.ContainsKey(key))
                {
                    return true;
                }
            }
            return false;
        }

        /// <summary>Brings conditions, transitions, pending and alarms up to date at <paramref name="t"/>; idempotent.</summary>
        public void Step(DateTimeOffset t)
        {
            if (IsSettled(t))
            {
                return;
            }
            var before = State;
            StepOnce(t);
            if (ReferenceEquals(State, before))
            {
                // nothing changed (every event comes with a state change): the state is a fixed point at t
                Settled(t);
            }
        }
    }
}
