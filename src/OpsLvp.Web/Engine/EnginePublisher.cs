using OpsLvp.Core.Engine;
using OpsLvp.Core.Optics;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The publish step of the engine host (DEVELOPERS.md "Data flow"): turns a committed state into a numbered
/// <see cref="LiveSnapshot"/> for <see cref="LiveState"/> (pages and hub), at once on a change and otherwise as a
/// heartbeat every 2 s. Versions only grow, also across runs of the same process.
/// </summary>
internal sealed class EnginePublisher(LiveState live, FeedHealthRegistry feeds, DemoMode demo)
{
    private static readonly TimeSpan s_heartbeat = TimeSpan.FromSeconds(2);

    private DateTimeOffset _lastPublishReal;
    private EngineState? _published;
    private long _version;

    /// <summary>Publishes <paramref name="state"/> unless it equals the last one and the heartbeat is not due (or <paramref name="force"/>).</summary>
    public void Publish(EngineRun run, EngineState state, DateTimeOffset now, DateTimeOffset realNow, bool force, IReadOnlyList<Alarm> hostAlarms, RecordingView recording)
    {
        var changed = _published is null || !(state with { EvaluatedAt = default }).Equals(_published with { EvaluatedAt = default });
        if (!force && !changed && realNow - _lastPublishReal < s_heartbeat)
        {
            return;
        }
        _version = Math.Max(_version + 1, realNow.ToUnixTimeMilliseconds());
        var snapshot = SnapshotBuilder.Build(
            _version, run.Engine, state, now, feeds.Snapshot(), run.Trends.At(now),
            demo.Enabled ? new DemoView(demo.Speed) : null, hostAlarms, recording, StepInUse(run.Derivation, state, now));
        _published = state;
        _lastPublishReal = realNow;
        live.Publish(snapshot);
    }

    /// <summary>The light step in use at <paramref name="now"/> with <paramref name="state"/>'s manual setting (docs/engine.md R20).</summary>
    private static LightStepInUse StepInUse(RvrDerivation derivation, EngineState state, DateTimeOffset now)
    {
        derivation.ManualStep = state.ManualLightStep;
        return derivation.StepInUse(now);
    }
}
