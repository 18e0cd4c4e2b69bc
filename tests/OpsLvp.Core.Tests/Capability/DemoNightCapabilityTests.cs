using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Tests.Profile;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>
/// The invented demo night (seed-demo) with its capability section: the scripted field-lighting crew reports the 07L TDZ
/// lights unserviceable at 22:30Z and clears them at 23:25Z; the wall's headline for 07L follows (docs/capability.md).
/// </summary>
public class DemoNightCapabilityTests
{
    private static readonly string Seed = Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo");

    private static ReplayResult Replay()
    {
        var readings = Path.Combine(Seed, "scenarios", "demo-night.csv");
        var actions = Path.Combine(Seed, "scenarios", "demo-night.actions.csv");
        return ReplayRunner.Run(
            ProfileValidator.LoadValidated(Path.Combine(Seed, "profile.json")),
            ReadingsCsv.Parse(File.ReadAllText(readings), readings),
            ActionsCsv.Parse(File.ReadAllText(actions), actions));
    }

    private static RunwayCapability At(ReplayResult r, string utc) =>
        r.Events.OfType<CapabilityChanged>().Last(c => c.At <= DateTimeOffset.Parse(utc, System.Globalization.CultureInfo.InvariantCulture)).After.Single(c => c.Direction == "07L");

    [Fact]
    public void TheScriptedFault_DowngradesTheRunwayInUse_AndItsClearanceRestoresIt()
    {
        var r = Replay();

        Assert.Empty(r.Events.OfType<CommandRefused>());
        var before = At(r, "2026-01-15T22:29:59Z");
        var during = At(r, "2026-01-15T22:30:00Z");
        var after = At(r, "2026-01-15T23:25:00Z");
        Assert.True(during.InUse);
        Assert.True(CapabilityEvaluator.IsDowngrade(before, during), $"{CapabilityWords.Summary(before)} -> {CapabilityWords.Summary(during)}");
        Assert.Contains("TDZ lights 07L unserviceable", CapabilityWords.FirstReason(during), StringComparison.Ordinal);
        Assert.False(CapabilityEvaluator.IsDowngrade(before, after), $"{CapabilityWords.Summary(before)} -> {CapabilityWords.Summary(after)}");
        Assert.Contains(r.Events.OfType<AlarmAcknowledged>(), a => a.Key == "capability-down:07L");
    }
}
