using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// The invented demo night (seed-demo) shows a well-run night: whether preparation starts on the amended TAF (20:31:00,
/// the live demo, which sends the forecasts) or on the observed RVR (20:37:06), every scripted tick comes before its
/// item is due. The one overdue item is meant: the optional <c>can-works-resume</c> is left open and closes as not done
/// when the episode ends (seed-demo/README.md "Actions"), so the demo also shows an overdue alarm and a not-done item.
/// </summary>
public class DemoNightOverdueTests
{
    [Theory]
    [InlineData(true)]
    [InlineData(false)]
    public void DemoNight_RaisesNoOverdueAlarm_ButTheDeliberateOptionalOne(bool withForecasts)
    {
        var r = DemoNightForecastTests.Replay(withForecasts);
        var overdue = r.Events.OfType<AlarmRaised>()
            .Where(a => a.Alarm.Kind == AlarmKind.ItemOverdue)
            .Select(a => $"{a.At.UtcDateTime:HH:mm} {a.Alarm.Key}")
            .ToList();
        // can-works-resume: cancellation opens at 00:44:00, the item is due 30 min later (illustrative)
        Assert.Equal(["01:14 item-overdue:can-works-resume"], overdue);
        Assert.DoesNotContain(r.Events, e => e is CommandRefused);
    }

    [Fact]
    public void WithForecasts_EveryPreparationTick_FollowsThePhaseStartAndBeatsItsDueTime()
    {
        var r = DemoNightForecastTests.Replay(withForecasts: true);
        var start = r.Events.OfType<PhaseTransition>().First(t => t.To == Phase.Preparation).At;
        Assert.Equal(new DateTimeOffset(2026, 1, 15, 20, 31, 0, TimeSpan.Zero), start);
        var done = r.Events.OfType<ItemTicked>().Where(t => t.ItemId.StartsWith("prep-", StringComparison.Ordinal)).ToList();
        Assert.Equal(6, done.Count);
        Assert.All(done, t => Assert.True(t.At > start, $"{t.ItemId} ticked {t.At:HH:mm} before preparation began"));
    }
}
