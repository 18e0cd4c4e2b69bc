using Bunit;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>The tablet card names its item's phase in the one vocabulary's words and casing (Core/Presentation/LvpVocabulary). Items invented.</summary>
public sealed class ActionCardPhaseWordsTests : LiveComponentTest
{
    [Theory]
    [InlineData(Phase.Preparation, "LVP preparation")]
    [InlineData(Phase.Active, "LVP in force")]
    [InlineData(Phase.Cancellation, "Cancelling LVP")]
    public void CardMeta_NamesThePhase_AsTheVocabularyDoes(Phase phase, string words)
    {
        SignIn("kim (invented)", Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, phase: phase, items: [TestSnapshots.Item("X1", "airside", phase: phase)]));
        var cut = Render<TabletActions>();

        var meta = cut.Find("[data-testid=action-item][data-item-id=X1] .action-meta").TextContent;
        Assert.Equal($"X1 · {TestSnapshots.TeamName("airside")} · {words}", meta.Trim());
    }
}
