using System.Collections.Immutable;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    /// <summary>The conditions at <paramref name="t"/> (internal: used by status and tests through the engine).</summary>
    internal static Situation Situate(EngineModel model, EngineState state, DateTimeOffset t)
    {
        var thresholds = model.Profile.Thresholds;
        double? rvr = null;
        GoverningSensor? rvrSensor = null;
        var rvrMissing = new List<string>();
        var (governing, governingKeys) = model.GoverningIn(state); // follows the runway in use (docs/engine.md R34)
        for (var gi = 0; gi < governing.Count; gi++)
        {
            var g = governing[gi];
            if (state.OutOfService.Contains(g.SensorId))
            {
                continue;
            }
            if (state.Latest.TryGetValue(governingKeys[gi], out var r) && model.IsFresh(r, t))
            {
                if (rvr is null || r.Value < rvr)
                {
                    rvr = r.Value;
                    rvrSensor = g;
                }
            }
            else if (!rvrMissing.Contains(g.SensorId))
            {
                rvrMissing.Add(g.SensorId);
            }
        }
        double? ceiling = null;
        string? ceilingSensor = null;
        var ceilingMissing = new List<string>();
        var ceilometers = model.Ceilometers;
        for (var ci = 0; ci < ceilometers.Count; ci++)
        {
            var id = ceilometers[ci];
            if (state.OutOfService.Contains(id))
            {
                continue;
            }
            var any = false;
            foreach (var key in model.CeilometerKeys[ci])
            {
                if (state.Latest.TryGetValue(key, out var r) && model.IsFresh(r, t))
                {
                    any = true;
                    if (ceiling is null || r.Value < ceiling)
                    {
                        ceiling = r.Value;
                        ceilingSensor = id;
                    }
                }
            }
            if (!any)
            {
                ceilingMissing.Add(id);
            }
        }
        var forecast = state.DeteriorationForecast;
        // Entry per phase: below, or at or below (docs/engine.md R18).
        var a = thresholds.Active;
        var p = thresholds.Preparation;
        var active = a.Enters(rvr, a.RvrBelowM) || a.Enters(ceiling, a.CeilingBelowFt);
        var preparation = forecast || p.Enters(rvr, p.RvrBelowM) || p.Enters(ceiling, p.CeilingBelowFt);
        bool Recovered(PhaseThresholds phase)
        {
            var rvrLimit = phase.RvrRecoverM ?? phase.RvrBelowM;
            var ceilingLimit = phase.CeilingRecoverFt ?? phase.CeilingBelowFt;
            var rvrOk = !model.RvrConfigured || rvrLimit is null || (rvr is { } v && rvrMissing.Count == 0 && v >= rvrLimit);
            var ceilingOk = !model.CeilingConfigured || ceilingLimit is null || (ceiling is { } c && ceilingMissing.Count == 0 && c >= ceilingLimit);
            return rvrOk && ceilingOk;
        }
        return new Situation(
            t, rvr, rvrSensor, rvrMissing, ceiling, ceilingSensor, ceilingMissing, forecast,
            active, preparation, Recovered(thresholds.Active), !forecast && Recovered(thresholds.Preparation));
    }

    internal static IEnumerable<ReadingKind> CeilingKinds(EngineModel model) => model.CeilingKinds;

    private sealed partial class Run
    {
        /// <summary>Escalation dwells are measured from no earlier than the last manual relaxation (R9).</summary>
        private DateTimeOffset DwellStart(ConditionKind kind, DateTimeOffset since) =>
            kind is ConditionKind.Active or ConditionKind.Preparation && State.EscalationMeasuredFrom is { } from && from > since
                ? from
                : since;

        private bool DwellDone(ConditionKind kind, DateTimeOffset t) =>
            State.HoldingSince.TryGetValue(kind, out var since) && DwellStart(kind, since) + _model.Dwell(kind) <= t;

        // The last situation computed in this run and what it was computed from (Situate reads only these).
        private Situation? _sit;
        private ImmutableDictionary<string, Reading>? _sitLatest;
        private ImmutableHashSet<string>? _sitOutOfService;
        private bool _sitForecast;
        private ImmutableDictionary<string, string>? _sitDirections;

        /// <summary><see cref="Situate"/> at <paramref name="t"/>, reusing the last result when its inputs are the same objects.</summary>
        private Situation SituateNow(DateTimeOffset t)
        {
            if (_sit is { } last && last.At == t && ReferenceEquals(_sitLatest, State.Latest)
                && ReferenceEquals(_sitOutOfService, State.OutOfService) && _sitForecast == State.DeteriorationForecast
                && ReferenceEquals(_sitDirections, State.DirectionsInUse))
            {
                return last;
            }
            _sit = Situate(_model, State, t);
            _sitLatest = State.Latest;
            _sitOutOfService = State.OutOfService;
            _sitForecast = State.DeteriorationForecast;
            _sitDirections = State.DirectionsInUse;
            return _sit;
        }

        private void UpdateHolding(Situation sit, DateTimeOffset t)
        {
            var holding = State.HoldingSince;
            foreach (var kind in EngineModel.AllConditions)
            {
                var holds = sit.Holds(kind);
                if (holds && !holding.ContainsKey(kind))
                {
                    holding = holding.SetItem(kind, t);
                }
                else if (!holds && holding.ContainsKey(kind))
                {
                    holding = holding.Remove(kind);
                }
            }
            if (!ReferenceEquals(holding, State.HoldingSince))
            {
                State = State with { HoldingSince = holding };
            }
        }
    }
}
