using Bunit;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>
/// The tablet's facility report (docs/capability.md, docs/engine.md R30): a team reports a fault on a facility it owns
/// in two taps plus a reason, and sees only its own facilities. Facilities, teams and people are invented.
/// </summary>
public sealed class FacilityReportTests : LiveComponentTest
{
    private const string Ash = "ash (invented)";

    private static LiveSnapshot Snapshot(long version, IReadOnlyDictionary<string, FacilityState>? states = null)
    {
        var snapshot = TestSnapshots.Make(version, phase: Phase.Normal);
        return snapshot with
        {
            Status = snapshot.Status with
            {
                FacilityConfigs =
                [
                    new FacilityConfig("tdzl-07l", "TDZ lights 07L", FacilityKind.TdzLights, ["07L"], "lighting"),
                    new FacilityConfig("ils-07l", "ILS 07L", FacilityKind.Ils, ["07L"], "airside"),
                    new FacilityConfig("sb-07l", "Stop bars 07L", FacilityKind.StopBars, ["07L"], "lighting"),
                ],
                Facilities = states ?? new Dictionary<string, FacilityState>(),
            },
        };
    }

    [Fact]
    public void ShowsOnlyTheTeamsOwnFacilities_WithTheirStatus()
    {
        SignIn(Ash, Roles.GroundStaff, "lighting");
        Live.Set(Snapshot(1, new Dictionary<string, FacilityState>
        {
            ["sb-07l"] = new(FacilityStatus.Unserviceable, "bar 3 dark (invented)", "lee (invented)", TestSnapshots.T0),
        }));

        var cut = Render<TabletActions>();

        var picks = cut.FindAll("[data-testid=facility-pick]");
        Assert.Equal(["tdzl-07l", "sb-07l"], picks.Select(p => p.GetAttribute("data-facility")));
        Assert.Equal("serviceable", picks[0].QuerySelector("[data-testid=facility-state]")!.TextContent.Trim());
        Assert.Equal("unserviceable: bar 3 dark (invented) (lee (invented) at 03:00Z)", picks[1].QuerySelector("[data-testid=facility-state]")!.TextContent.Trim());
    }

    [Fact]
    public void ATeamOwningNoFacility_SeesNoReportSection()
    {
        SignIn(Ash, Roles.GroundStaff, "rescue");
        Live.Set(Snapshot(1));

        var cut = Render<TabletActions>();

        Assert.Empty(cut.FindAll("[data-testid=facility-report]"));
    }

    [Fact]
    public void FacilityThenStatusThenReason_SendsTheReportAsTheOwningTeam()
    {
        SignIn(Ash, Roles.GroundStaff, "lighting");
        Live.Set(Snapshot(1));
        var cut = Render<TabletActions>();

        cut.Find("[data-facility='tdzl-07l']").Click();                              // tap 1
        cut.Find("[data-testid=facility-status][data-status=unserviceable]").Click();  // tap 2
        Assert.True(cut.Find("[data-testid=facility-send]").HasAttribute("disabled")); // no reason yet
        Assert.Empty(Commands.Calls);
        cut.Find("[data-testid=facility-reason-step] input").Input("circuit 3 tripped (invented)");
        cut.Find("[data-testid=facility-send]").Click();

        var (caller, command) = Assert.Single(Commands.Calls);
        Assert.Equal(Ash, caller.Name);
        Assert.Equal(new SetFacilityStatus(Ash, "tdzl-07l", FacilityStatus.Unserviceable, "circuit 3 tripped (invented)", "lighting"), command);
        Assert.Equal("Reported: TDZ lights 07L unserviceable", cut.Find("[data-testid=facility-message]").TextContent.Trim());
        Assert.NotEmpty(cut.FindAll("[data-testid=facility-pick]")); // back to the list
    }

    [Fact]
    public void ARefusal_IsShownWithTheServersReason_AndTheReasonIsKept()
    {
        SignIn(Ash, Roles.GroundStaff, "lighting");
        Live.Set(Snapshot(1));
        Commands.NextOutcome = new CommandOutcome(CommandOutcomeKind.Refused, "facility sb-07l is reported by another team");
        var cut = Render<TabletActions>();

        cut.Find("[data-facility='sb-07l']").Click();
        cut.Find("[data-testid=facility-status][data-status=degraded]").Click();
        cut.Find("[data-testid=facility-reason-step] input").Input("two segments dark (invented)");
        cut.Find("[data-testid=facility-send]").Click();

        Assert.Equal("facility sb-07l is reported by another team", cut.Find("[data-testid=facility-message]").TextContent.Trim());
        Assert.NotNull(cut.Find("[data-testid=facility-reason-step]"));
    }

    [Fact]
    public void Back_ReturnsToTheList_WithoutSending()
    {
        SignIn(Ash, Roles.GroundStaff, "lighting");
        Live.Set(Snapshot(1));
        var cut = Render<TabletActions>();

        cut.Find("[data-facility='tdzl-07l']").Click();
        cut.Find("[data-testid=facility-back]").Click();

        Assert.NotEmpty(cut.FindAll("[data-testid=facility-pick]"));
        Assert.Empty(Commands.Calls);
    }
}
