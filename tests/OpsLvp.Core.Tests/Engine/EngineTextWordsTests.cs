using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// The engine's own texts (alarms, waits, refusals, manual-action details) name phases in the one vocabulary's words
/// (Core/Presentation/LvpVocabulary), never by internal codes or with an ASCII arrow. Actors and reasons are invented.
/// </summary>
public class EngineTextWordsTests
{
    private const string Dm = "duty manager (invented)";

    [Fact]
    public void DeclaredHold_IsWordedWithTheVocabularyInTheWaitAndTheReleaseDetail()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(10, new DeclarePhase(Dm, Phase.Active, "fog bank approaching (invented)"));
        var status = d.Engine.Describe(d.State, EngineDriver.At(20));
        var hold = Assert.Single(status.Waiting, w => w.Kind == WaitKind.Hold);
        Assert.Equal($"hold: {LvpVocabulary.For(Phase.Active).Name} declared by {Dm}; no automatic relaxation below it until released", hold.Text);

        var events = d.Run(30, new ReleaseHold(Dm, "fog did not arrive (invented)"));
        var release = Assert.Single(events.OfType<ManualActionApplied>());
        Assert.Equal($"released hold on LVP in force declared by {Dm}", release.Detail);
    }

    [Fact]
    public void CancelDetail_NamesThePhaseLeftInTheVocabularysWords()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(10, new DeclarePhase(Dm, Phase.Active, "fog bank approaching (invented)"));
        var events = d.Run(20, new CancelLvp(Dm, "fog cleared early (invented)"));
        var cancel = Assert.Single(events.OfType<ManualActionApplied>(), m => m.Action == "cancel");
        Assert.Equal("cancelled LVP in force", cancel.Detail);
    }

    [Fact]
    public void DeclaringAPhaseOutsideTheEnum_IsRefusedWithoutThrowing()
    {
        var reason = CommandPreconditions.Check(new DeclarePhase(Dm, (Phase)99, "x"), TestProfiles.Standard());
        Assert.Equal("only LVP preparation or LVP in force can be declared, not 99", reason);
    }
}
