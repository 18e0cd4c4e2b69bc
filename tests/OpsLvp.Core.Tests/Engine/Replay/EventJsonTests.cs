using System.Text.Json;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// The condition snapshot of transition and proposal lines carries values, sensors and the thresholds in effect
/// (docs/engine.md R12), after the docs/cli.md fields. Check values are the invented scenario profile's own thresholds
/// (Scenarios/xdmo-profile.json, xdmo-confirm-profile.json).
/// </summary>
public class EventJsonTests
{
    private static ReplayResult Replay(string profile, string name, out AerodromeProfile loaded)
    {
        loaded = ProfileLoader.Load(ReplayScenarioTests.Scenario(profile));
        var readingsFile = ReplayScenarioTests.Scenario($"{name}.readings.csv");
        var actionsFile = ReplayScenarioTests.Scenario($"{name}.actions.csv");
        return ReplayRunner.Run(
            loaded,
            ReadingsCsv.Parse(File.ReadAllText(readingsFile), readingsFile),
            ActionsCsv.Parse(File.ReadAllText(actionsFile), actionsFile));
    }

    private static void AssertThresholds(JsonElement thresholds, string phase, double rvrBelow, double rvrRecover, double ceilingBelow, double ceilingRecover, int enterDwell, int recoverDwell)
    {
        var p = thresholds.GetProperty(phase);
        Assert.Equal(
            [("rvr_below_m", rvrBelow), ("rvr_recover_m", rvrRecover), ("ceiling_below_ft", ceilingBelow), ("ceiling_recover_ft", ceilingRecover),
             ("enter_dwell_seconds", enterDwell), ("recover_dwell_seconds", recoverDwell)],
            p.EnumerateObject().Select(x => (x.Name, x.Value.GetDouble())).ToList());
    }

    [Fact]
    public void Transition_CarriesBothPhasesThresholds_AfterTheFixedFields()
    {
        var r = Replay("xdmo-profile.json", "r8-episode", out _);
        var line = EventJson.ToLine(r.Events.OfType<PhaseTransition>().First());
        using var doc = JsonDocument.Parse(line);
        var names = doc.RootElement.EnumerateObject().Select(p => p.Name).ToList();
        // docs/cli.md: event, time, from, to, by, reason first and in this order
        Assert.Equal(["event", "time", "from", "to", "by", "reason"], names.Take(6));
        Assert.Equal("thresholds", names[^1]);
        var t = doc.RootElement.GetProperty("thresholds");
        // xdmo-profile.json thresholds (invented)
        AssertThresholds(t, "preparation", 1000, 1100, 300, 350, 30, 900);
        AssertThresholds(t, "active", 550, 650, 200, 250, 30, 600);
    }

    [Fact]
    public void Proposal_CarriesTheThresholdsToo()
    {
        var r = Replay("xdmo-confirm-profile.json", "r10-confirm", out _);
        var line = EventJson.ToLine(r.Events.OfType<TransitionProposed>().First());
        using var doc = JsonDocument.Parse(line);
        Assert.Equal(["event", "time", "from", "to", "reason"], doc.RootElement.EnumerateObject().Select(p => p.Name).Take(5));
        var t = doc.RootElement.GetProperty("thresholds");
        // xdmo-confirm-profile.json thresholds (invented), same values as xdmo-profile.json
        AssertThresholds(t, "preparation", 1000, 1100, 300, 350, 30, 900);
        AssertThresholds(t, "active", 550, 650, 200, 250, 30, 600);
    }

    [Fact]
    public void Thresholds_APhaseWithoutCeiling_WritesNullForItsCeilingPair()
    {
        var r = Replay("xdmo-profile.json", "r8-episode", out var profile);
        var first = r.Events.OfType<PhaseTransition>().First();
        var noCeiling = profile.Thresholds.Preparation with { CeilingBelowFt = null, CeilingRecoverFt = null };
        var edited = first with { Snapshot = first.Snapshot with { Thresholds = profile.Thresholds with { Preparation = noCeiling } } };
        using var doc = JsonDocument.Parse(EventJson.ToLine(edited));
        var prep = doc.RootElement.GetProperty("thresholds").GetProperty("preparation");
        Assert.Equal(JsonValueKind.Null, prep.GetProperty("ceiling_below_ft").ValueKind);
        Assert.Equal(JsonValueKind.Null, prep.GetProperty("ceiling_recover_ft").ValueKind);
        Assert.Equal(1000, prep.GetProperty("rvr_below_m").GetDouble());
    }
}
