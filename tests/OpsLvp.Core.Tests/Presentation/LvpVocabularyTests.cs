using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Tests.Presentation;

public sealed class LvpVocabularyTests
{
    [Fact]
    public void EveryState_HasExactlyOneEntry_WithItsOwnNameAndGlyph()
    {
        var states = Enum.GetValues<LvpState>();
        Assert.Equal(states.Length, LvpVocabulary.All.Count);
        Assert.All(states, s => Assert.Equal(s, LvpVocabulary.Of(s).State));
        Assert.Equal(states.Length, LvpVocabulary.All.Select(w => w.Name).Distinct().Count());
        Assert.Equal(states.Length, LvpVocabulary.All.Select(w => w.Glyph).Distinct().Count());
        Assert.All(LvpVocabulary.All, w => Assert.Equal(w.Name.ToUpperInvariant(), w.Headline));
    }

    [Fact]
    public void Active_IsLvpInForce()
    {
        // "LVP in force": the trade's words (common practice); the engine enters active only once safeguarded or by an
        // audited override (docs/engine.md R13).
        Assert.Equal("LVP in force", LvpVocabulary.For(Status(Phase.Active, conditionsMet: false)).Name);
    }

    [Fact]
    public void PreparationHeldForSafeguards_IsNeverCalledInForce()
    {
        // docs/engine.md R13: LVP are declared in force only once safeguarding is complete (EUR Doc 013, from memory).
        var words = LvpVocabulary.For(Status(Phase.Preparation, conditionsMet: true));
        Assert.Equal(LvpState.ConditionsMetSafeguardsIncomplete, words.State);
        Assert.Equal("LVP conditions met — safeguards incomplete", words.Name);
        Assert.DoesNotContain("in force", words.Name, StringComparison.OrdinalIgnoreCase);
    }

    [Theory]
    [InlineData(Phase.Normal, "Normal operations", "normal")]
    [InlineData(Phase.Preparation, "LVP preparation", "preparation")]
    [InlineData(Phase.Active, "LVP in force", "active")]
    [InlineData(Phase.Cancellation, "Cancelling LVP", "cancellation")]
    public void EachPhase_HasTheTradesName_AndKeepsItsExportCode(Phase phase, string name, string code)
    {
        // Names: common practice in the trade; codes: the phase names of docs/engine.md (exports and JSON keep them).
        Assert.Equal(name, LvpVocabulary.For(phase).Name);
        Assert.Equal(code, LvpVocabulary.For(phase).Code);
    }

    [Fact]
    public void APhaseChange_ReadsAsWords_WithoutAnAsciiArrow()
    {
        var text = LvpVocabulary.Change(Phase.Preparation, Phase.Active);
        Assert.Equal("LVP preparation to LVP in force", text);
        Assert.DoesNotContain("->", text, StringComparison.Ordinal);
    }

    [Fact]
    public void TheDeclareButton_NamesThePhaseInTheTradesWords()
    {
        Assert.Equal("Declare LVP in force…", LvpVocabulary.DeclareButton(Phase.Active));
        Assert.Equal("Declare LVP preparation…", LvpVocabulary.DeclareButton(Phase.Preparation));
    }

    [Fact]
    public void ARelaxationAgainstConditions_NamesWhoDidIt()
    {
        Assert.Equal("relaxed by j.invented against conditions", LvpVocabulary.RelaxedAgainstConditions(" j.invented "));
    }

    [Fact]
    public void AnUnknownState_IsRefused()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => LvpVocabulary.Of((LvpState)99));
        Assert.Throws<ArgumentOutOfRangeException>(() => LvpVocabulary.For((Phase)99));
    }

    private static EngineStatus Status(Phase phase, bool conditionsMet) =>
        new(DateTimeOffset.UnixEpoch, phase, DateTimeOffset.UnixEpoch, null, null, null, false, [],
            new OpsLvp.Core.Profile.ThresholdSet(new(), new()),
            false, null, null, [], [])
        { ConditionsMetSafeguardsIncomplete = conditionsMet, SafeguardsComplete = !conditionsMet };
}
