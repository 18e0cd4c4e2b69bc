using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Tests.Profile;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// docs/engine.md R13 over the invented demo night (seed-demo): with one mandatory preparation tick moved after the
/// instant the active condition has held its dwell (21:42:06Z, seed-demo/README.md), preparation is held until that
/// tick and LVP are in force at its instant.
/// </summary>
public class DemoNightSafeguardsTests
{
    private static readonly string Seed = Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo");

    private static ReplayResult Replay(Func<string, string> editActions)
    {
        var readings = Path.Combine(Seed, "scenarios", "demo-night.csv");
        var actions = editActions(File.ReadAllText(Path.Combine(Seed, "scenarios", "demo-night.actions.csv")));
        return ReplayRunner.Run(
            ProfileValidator.LoadValidated(Path.Combine(Seed, "profile.json")),
            ReadingsCsv.Parse(File.ReadAllText(readings), readings),
            ActionsCsv.Parse(actions, "demo-night.actions.csv (edited)"));
    }

    [Fact]
    public void LateLastSafeguard_HoldsPreparation_ThenLvpInForceAtItsInstant()
    {
        var r = Replay(text =>
        {
            var lines = text.Split('\n', StringSplitOptions.RemoveEmptyEntries).ToList();
            var tick = lines.Single(l => l.Contains(",prep-vehicles,", StringComparison.Ordinal));
            lines.Remove(tick);
            lines.Add("2026-01-15T21:42:30Z,a.ferreira,tick,prep-vehicles,security-patrol,late (invented)");
            return string.Join('\n', new[] { lines[0] }.Concat(lines.Skip(1).OrderBy(l => l[..20], StringComparer.Ordinal))) + "\n";
        });
        var transitions = r.Events.OfType<PhaseTransition>().Select(t => $"{t.At.UtcDateTime:HH:mm:ss} {t.From}->{t.To}").ToList();
        Assert.Equal(["20:37:06 Normal->Preparation", "21:42:30 Preparation->Active", "00:44:00 Active->Cancellation", "01:25:00 Cancellation->Normal"], transitions);
        var raised = r.Events.OfType<AlarmRaised>().First(a => a.Alarm.Kind == AlarmKind.SafeguardsIncomplete);
        Assert.True(raised.At <= new DateTimeOffset(2026, 1, 15, 21, 42, 6, TimeSpan.Zero));
    }

    [Fact]
    public void AsScripted_TheNightKeepsItsTimes_AndCancellationIsConfirmed()
    {
        var r = Replay(text => text);
        var transitions = r.Events.OfType<PhaseTransition>().Select(t => $"{t.At.UtcDateTime:HH:mm:ss} {t.From}->{t.To} {t.By}").ToList();
        Assert.Equal(["20:37:06 Normal->Preparation Auto", "21:42:06 Preparation->Active Auto", "00:44:00 Active->Cancellation Manual", "01:25:00 Cancellation->Normal Auto"], transitions);
        Assert.DoesNotContain(r.Events, e => e is CommandRefused);
    }
}
