using Bunit;
using Bunit.Rendering;
using MudBlazor;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Console;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Console;

/// <summary>The console's facility board, runway in use and observer RVR entry (docs/capability.md). Facilities and names invented.</summary>
public sealed class CapabilityBoardTests : LiveComponentTest
{
    private const string Dm = "dana (invented)";

    private static readonly CommandCaller DmCaller = new(Dm, new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    private static EngineStatus Status() => TestSnapshots.Make(1).Status with
    {
        FacilityConfigs =
        [
            new FacilityConfig("tdzl-07l", "TDZ lights 07L", FacilityKind.TdzLights, ["07L"], "field-lighting"),
            new FacilityConfig("sb-07l", "Stop bars 07L", FacilityKind.StopBars, ["07L"], "field-lighting"),
        ],
        Facilities = new Dictionary<string, FacilityState>
        {
            ["sb-07l"] = new FacilityState(FacilityStatus.Unserviceable, "bar 3 dark (invented)", "ash (invented)", TestSnapshots.T0),
        },
        DirectionsInUse = new Dictionary<string, string> { ["07L/25R"] = "07L" },
        RunwayDirections = new Dictionary<string, IReadOnlyList<string>> { ["07L/25R"] = ["07L", "25R"] },
    };

    private IRenderedComponent<ContainerFragment> RenderBoard(bool dutyManager, EngineStatus? status = null) => Render(b =>
    {
        b.OpenComponent<MudPopoverProvider>(0);
        b.CloseComponent();
        b.OpenComponent<MudDialogProvider>(1);
        b.CloseComponent();
        b.OpenComponent<MudSnackbarProvider>(2);
        b.CloseComponent();
        b.OpenComponent<CapabilityBoard>(3);
        b.AddAttribute(4, nameof(CapabilityBoard.Status), status ?? Status());
        b.AddAttribute(5, nameof(CapabilityBoard.Caller), DmCaller);
        b.AddAttribute(6, nameof(CapabilityBoard.IsDutyManager), dutyManager);
        b.CloseComponent();
    });

    [Fact]
    public void ShowsEachFacilityStatusAndTheRunwayInUse()
    {
        var cut = RenderBoard(dutyManager: false);

        Assert.Equal("serviceable", cut.Find("[data-facility='tdzl-07l'] [data-testid=cap-facility-status]").TextContent.Trim());
        Assert.Equal("unserviceable: bar 3 dark (invented) (ash (invented) at 03:00Z)", cut.Find("[data-facility='sb-07l'] [data-testid=cap-facility-status]").TextContent.Trim());
        Assert.Equal("07L in use", cut.Find("[data-runway='07L/25R'] [data-testid=cap-runway-inuse]").TextContent.Trim());
        Assert.Empty(cut.FindAll("[data-testid=cap-facility-set]")); // buttons for duty managers only
    }

    [Fact]
    public void MarkingAFacilityUnserviceable_AsksAReason_AndSendsTheCommand()
    {
        var cut = RenderBoard(dutyManager: true);

        cut.Find("[data-facility='tdzl-07l'] [data-testid=cap-facility-set][data-status=unserviceable]").Click();
        cut.Find("[data-testid=reason-dialog] textarea").Input("circuit 3 tripped (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));
        var command = Assert.IsType<SetFacilityStatus>(Commands.Calls[0].Command);
        Assert.Equal(new SetFacilityStatus(Dm, "tdzl-07l", FacilityStatus.Unserviceable, "circuit 3 tripped (invented)"), command);
    }

    [Fact]
    public void ChangingTheRunwayInUse_AsksAReason_AndSendsTheCommand()
    {
        var cut = RenderBoard(dutyManager: true);

        cut.Find("[data-testid=cap-runway-set][data-direction='25R']").Click();
        cut.Find("[data-testid=reason-dialog] textarea").Input("wind change (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));
        Assert.Equal(new SetRunwayInUse(Dm, "07L/25R", "25R", "wind change (invented)"), Commands.Calls[0].Command);
    }

    [Fact]
    public void UseDirection_OffersTheProfilesDirections_NotPartsOfTheRunwayName()
    {
        // an invented runway named "north/main" whose directions are 09 and 27: its name is never split
        var status = Status() with
        {
            DirectionsInUse = new Dictionary<string, string> { ["north/main"] = "09" },
            RunwayDirections = new Dictionary<string, IReadOnlyList<string>> { ["north/main"] = ["09", "27"] },
        };
        var cut = RenderBoard(dutyManager: true, status);

        Assert.Equal(["27"], cut.FindAll("[data-testid=cap-runway-set]").Select(b => b.GetAttribute("data-direction")));
        cut.Find("[data-testid=cap-runway-set][data-direction='27']").Click();
        cut.Find("[data-testid=reason-dialog] textarea").Input("wind change (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));
        Assert.Equal(new SetRunwayInUse(Dm, "north/main", "27", "wind change (invented)"), Commands.Calls[0].Command);
    }
}
