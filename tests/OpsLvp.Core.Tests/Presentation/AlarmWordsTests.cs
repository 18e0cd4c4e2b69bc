using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Tests.Presentation;

public sealed class AlarmWordsTests
{
    private static readonly DateTimeOffset T = new(2026, 12, 1, 3, 0, 0, TimeSpan.Zero); // invented

    [Fact]
    public void AnEngineTextWithAnAsciiArrow_IsWrittenInTheVocabularysWords()
    {
        var alarm = new Alarm("x", AlarmKind.SensorSilent, "superseded: preparation -> active is due instead", T);
        Assert.Equal("superseded: LVP preparation to LVP in force is due instead", AlarmWords.Message(alarm, null));
    }

    [Fact]
    public void APendingAlarm_IsWordedFromThePendingTransition()
    {
        var pending = new PendingTransition(Phase.Active, Phase.Cancellation, T, "RVR 700 m ≥ 650 m (invented)",
            new ConditionSnapshot(T, 700, "S1", null, null, false, true, new(new(), new())));
        var alarm = new Alarm("pending", AlarmKind.PendingTransition, "confirm active -> cancellation: RVR 700 m ≥ 650 m (invented)", T);
        Assert.Equal("confirm LVP in force to Cancelling LVP: RVR 700 m ≥ 650 m (invented)", AlarmWords.Message(alarm, pending));
    }

    [Fact]
    public void EveryAlarmKind_HasAWordedLabel()
    {
        Assert.All(Enum.GetValues<AlarmKind>(), k => Assert.NotEqual(k.ToString(), AlarmWords.Label(k)));
    }
}
