using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R16: checklist items may name prerequisites (<c>after</c>). Common practice: the ILS areas are
/// released only after the tower confirms no low-visibility approach or take-off is in progress. Items invented.
/// </summary>
public class PrerequisiteTests
{
    private static AerodromeProfile WithAfter() => TestProfiles.Standard() with
    {
        Checklists = TestProfiles.Standard().Checklists with
        {
            Cancellation =
            [
                new ChecklistItemConfig("C0", "Tower confirms no LVP operation in progress (invented)", "atc", true, 10),
                new ChecklistItemConfig("C1", "Release vehicle restrictions (invented)", "airside", true, 10, ["C0"]),
            ],
        },
    };

    private static EngineDriver InCancellation()
    {
        var d = new EngineDriver(WithAfter());
        d.WeatherFromTo(0, 60, 500);
        d.Run(61, new CancelLvp("dm (invented)", "test (invented)"));
        Assert.Equal(Phase.Cancellation, d.State.Phase);
        return d;
    }

    [Fact]
    public void TickBeforeItsPrerequisite_IsRefusedWithTheList()
    {
        var d = InCancellation();
        var refused = Assert.Single(d.Run(70, new TickItem("kim (invented)", "airside", "C1")).OfType<CommandRefused>());
        Assert.Equal("item C1 comes after C0, still open", refused.Reason);
        Assert.Equal(ItemStatus.Open, d.State.Items.Last(i => i.ItemId == "C1").Status);
    }

    [Fact]
    public void TickAfterItsPrerequisite_IsAccepted_AlsoWhenThePrerequisiteIsNotApplicable()
    {
        var d = InCancellation();
        d.Run(70, new MarkNotApplicable("dm (invented)", "C0", "tower closed tonight (invented)"));
        Assert.Single(d.Run(71, new TickItem("kim (invented)", "airside", "C1")).OfType<ItemTicked>());
    }

    [Fact]
    public void Validator_RefusesUnknownSelfAndCyclicPrerequisites_NamingTheField()
    {
        var p = WithAfter();
        var unknown = p with { Checklists = p.Checklists with { Cancellation = [p.Checklists.Cancellation[0], p.Checklists.Cancellation[1] with { After = ["NOPE"] }] } };
        Assert.True(ProfileValidator.Validate(unknown).HasProblemAt("checklists.cancellation[1].after[0]"));
        var self = p with { Checklists = p.Checklists with { Cancellation = [p.Checklists.Cancellation[0], p.Checklists.Cancellation[1] with { After = ["C1"] }] } };
        Assert.True(ProfileValidator.Validate(self).HasProblemAt("checklists.cancellation[1].after[0]"));
        var cycle = p with { Checklists = p.Checklists with { Cancellation = [p.Checklists.Cancellation[0] with { After = ["C1"] }, p.Checklists.Cancellation[1]] } };
        var problem = Assert.Single(ProfileValidator.Validate(cycle).Problems, x => x.Field.EndsWith(".after", StringComparison.Ordinal));
        Assert.Equal("checklists.cancellation[0].after", problem.Field);
        Assert.Contains("C0 → C1 → C0", problem.Message, StringComparison.Ordinal);
        Assert.DoesNotContain(ProfileValidator.Validate(p).Problems, x => x.Field.Contains(".after", StringComparison.Ordinal));
    }
}
