using Bunit;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Components.Pages.Wall;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>
/// The wall's runway capability panel (docs/capability.md): in-use direction first, best approach category, LVTO, the
/// first reason, the observer label. Facilities, minima and directions are invented.
/// </summary>
public class WallCapabilityTests : BunitContext
{
    private static readonly CapabilityProfile Profile = new()
    {
        Facilities =
        [
            new FacilityConfig("ils-07l", "ILS 07L", FacilityKind.Ils, ["07L"], "ops", IlsCategory: OperationKind.CatIII),
            new FacilityConfig("tdzl-07l", "TDZ lights 07L", FacilityKind.TdzLights, ["07L"], "lighting"),
        ],
        Operations =
        [
            new OperationConfig("07L", OperationKind.CatI, ["ils-07l"], [new(RvrPosition.Tdz, 550)], NeedsLvp: false),
            new OperationConfig("07L", OperationKind.CatIII, ["ils-07l", "tdzl-07l"], [new(RvrPosition.Tdz, 175)], NeedsLvp: true),
            new OperationConfig("07L", OperationKind.Lvto, [], [new(RvrPosition.Tdz, 125)], NeedsLvp: true),
            new OperationConfig("25R", OperationKind.CatI, [], [new(RvrPosition.Tdz, 550)], NeedsLvp: false),
        ],
    };

    private static IReadOnlyList<RunwayCapability> Evaluate(double? tdz07, FacilityStatus tdzLights = FacilityStatus.Serviceable, bool observer = false)
    {
        var facilities = new Dictionary<string, FacilityState>();
        if (tdzLights != FacilityStatus.Serviceable)
        {
            facilities["tdzl-07l"] = new FacilityState(tdzLights, "circuit fault (invented)", "ash", DateTimeOffset.UnixEpoch);
        }
        List<PositionValue> positions =
        [
            new("07L", RvrPosition.Tdz, tdz07, observer ? RvrSource.Observer : RvrSource.Sensor, tdz07 is null || observer ? PositionGap.Silent : null, observer ? "sam" : null),
            new("25R", RvrPosition.Tdz, 2000, RvrSource.Sensor, null),
        ];
        return CapabilityEvaluator.Evaluate(Profile, new CapabilityInputs(facilities, positions, LvpStanding.InForce, new HashSet<string> { "07L" }));
    }

    private IRenderedComponent<WallCapability> RenderPanel(IReadOnlyList<RunwayCapability>? capability) =>
        Render<WallCapability>(p => p.Add(c => c.Capability, capability));

    [Fact]
    public void InUseDirectionFirst_WithBestCategoryAndLvto()
    {
        var cut = RenderPanel(Evaluate(2000));

        var rows = cut.FindAll("[data-testid=wall-cap-row]");
        Assert.Equal(["07L", "25R"], rows.Select(r => r.GetAttribute("data-direction")));
        Assert.Contains("IN USE", rows[0].TextContent, StringComparison.Ordinal);
        Assert.DoesNotContain("IN USE", rows[1].TextContent, StringComparison.Ordinal);
        Assert.Equal("CAT III", rows[0].QuerySelector("[data-testid=wall-cap-best]")!.TextContent.Trim());
        Assert.Equal("LVTO available", rows[0].QuerySelector("[data-testid=wall-cap-lvto]")!.TextContent.Trim());
        Assert.Null(rows[0].QuerySelector("[data-testid=wall-cap-reason]"));
    }

    [Fact]
    public void AFacilityFault_ShowsTheLowerCategoryAndTheFirstReason()
    {
        var cut = RenderPanel(Evaluate(2000, FacilityStatus.Unserviceable));

        var row = cut.Find("[data-direction='07L']");
        Assert.Equal("CAT I", row.QuerySelector("[data-testid=wall-cap-best]")!.TextContent.Trim());
        Assert.Equal("CAT III: TDZ lights 07L unserviceable (circuit fault (invented))", row.QuerySelector("[data-testid=wall-cap-reason]")!.TextContent.Trim());
    }

    [Fact]
    public void NothingAvailable_IsMarked_AndTheRvrReasonIsWorded()
    {
        var cut = RenderPanel(Evaluate(100));

        var row = cut.Find("[data-direction='07L']");
        Assert.Contains("wall-cap-none", row.ClassList);
        Assert.Equal("no CAT approach", row.QuerySelector("[data-testid=wall-cap-best]")!.TextContent.Trim());
        Assert.Equal("LVTO not available", row.QuerySelector("[data-testid=wall-cap-lvto]")!.TextContent.Trim());
        Assert.Equal("CAT III: RVR TDZ 100 m below the 175 m this operation needs", row.QuerySelector("[data-testid=wall-cap-reason]")!.TextContent.Trim());
    }

    [Fact]
    public void AnObserverValue_IsLabelled()
    {
        var cut = RenderPanel(Evaluate(600, observer: true));

        Assert.NotNull(cut.Find("[data-direction='07L'] [data-testid=wall-cap-observer]"));
        Assert.Empty(cut.FindAll("[data-direction='25R'] [data-testid=wall-cap-observer]"));
    }

    [Fact]
    public void WithoutACapabilitySection_ThePanelIsAbsent()
    {
        var cut = RenderPanel(null);

        Assert.Empty(cut.FindAll("[data-testid=wall-capability]"));
    }
}
