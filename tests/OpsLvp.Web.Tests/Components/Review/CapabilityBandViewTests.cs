using Bunit;
using OpsLvp.Core.Review;
using OpsLvp.Web.Components.Review;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Review;

/// <summary>The review page's capability bands and the what-if side by side (docs/capability.md "Review", "What-if"). Facilities and reasons invented.</summary>
public sealed class CapabilityBandViewTests : LiveComponentTest
{
    private static readonly DateTimeOffset T0 = new(2026, 12, 1, 22, 0, 0, TimeSpan.Zero);

    private static CapabilityState Cat3(string direction, bool inUse) => new(direction, inUse, "CAT III", "LVTO available", []);

    private static CapabilityState Cat2(string direction, bool inUse) =>
        new(direction, inUse, "CAT II", "LVTO available", ["CAT III: TDZ lights 07L unserviceable (circuit 3 tripped (invented))"]);

    private static CapabilityBand Band(string direction, bool inUse, params (double From, double To, CapabilityState State)[] segments) =>
        new(direction, inUse, segments.Select(s => new CapabilitySegment(T0.AddMinutes(s.From), T0.AddMinutes(s.To), s.State)).ToList());

    [Fact]
    public void EachDirectionIsARow_InTheGivenOrder_SegmentsPlacedAndLabelledInWords_WithTheFirstReasonOnHover()
    {
        var bands = new[]
        {
            Band("07L", true, (0, 30, Cat3("07L", true)), (30, 60, Cat2("07L", true)), (60, 120, Cat3("07L", true))),
            Band("07R", false, (0, 120, new CapabilityState("07R", false, "no CAT approach", "", ["CAT I: RVR TDZ sensor silent"]))),
        };

        var cut = Render<CapabilityBandView>(p => p.Add(c => c.Bands, bands).Add(c => c.From, T0).Add(c => c.To, T0.AddMinutes(120)).Add(c => c.TestId, "band"));

        var rows = cut.FindAll("[data-testid=cap-band]");
        Assert.Equal(["07L", "07R"], rows.Select(r => r.GetAttribute("data-direction")));
        Assert.Contains("07L (in use)", rows[0].TextContent, StringComparison.Ordinal);
        var segments = rows[0].QuerySelectorAll("[data-testid=cap-band-segment]");
        Assert.Equal(["CAT III · LVTO available", "CAT II · LVTO available", "CAT III · LVTO available"], segments.Select(s => s.TextContent.Trim()));
        Assert.Equal("left:25%;width:25%", segments[1].GetAttribute("style"));
        Assert.Equal("07L (in use) 22:30:00Z–23:00:00Z: CAT II, LVTO available. Not available: CAT III: TDZ lights 07L unserviceable (circuit 3 tripped (invented))",
            segments[1].GetAttribute("title"));
        Assert.Equal(segments[1].GetAttribute("title"), segments[1].GetAttribute("aria-label"));
        var none = rows[1].QuerySelector("[data-testid=cap-band-segment]")!;
        Assert.Equal("no CAT approach", none.TextContent.Trim());
        Assert.EndsWith("Not available: CAT I: RVR TDZ sensor silent", none.GetAttribute("title"), StringComparison.Ordinal);
    }

    [Fact]
    public void NoBands_SaysSo()
    {
        var cut = Render<CapabilityBandView>(p => p.Add(c => c.Bands, []).Add(c => c.From, T0).Add(c => c.To, T0.AddMinutes(60)).Add(c => c.TestId, "band"));

        Assert.NotNull(cut.Find("[data-testid=band-none]"));
        Assert.Empty(cut.FindAll("[data-testid=cap-band]"));
    }

    [Fact]
    public void WhatIf_ShowsRecordedAndWhatIfBandsPerDirection_SideBySide_AndWhichDiffer()
    {
        var actual = new[]
        {
            Band("07L", true, (0, 60, Cat3("07L", true)), (60, 120, Cat2("07L", true))),
            Band("07R", false, (0, 120, Cat3("07R", false))),
        };
        var alternative = new[]
        {
            Band("07L", true, (0, 120, Cat3("07L", true))),
            Band("07R", false, (0, 120, Cat3("07R", false))),
        };

        var cut = Render<CapabilityCompare>(p => p.Add(c => c.Actual, actual).Add(c => c.Alternative, alternative).Add(c => c.From, T0).Add(c => c.To, T0.AddMinutes(120)));

        var directions = cut.FindAll("[data-testid=whatif-capability-direction]");
        Assert.Equal([("07L", "true"), ("07R", "false")], directions.Select(d => (d.GetAttribute("data-direction"), d.GetAttribute("data-differs"))));
        Assert.Equal("07L: differs from recorded", directions[0].QuerySelector("[data-testid=whatif-capability-verdict]")!.TextContent.Trim());
        var recorded = directions[0].QuerySelector("[data-testid=whatif-capability-recorded]")!.QuerySelectorAll("[data-testid=cap-band-segment]");
        var whatIf = directions[0].QuerySelector("[data-testid=whatif-capability-alternative]")!.QuerySelectorAll("[data-testid=cap-band-segment]");
        Assert.Equal(["CAT III", "CAT II"], recorded.Select(s => s.GetAttribute("data-best")));
        Assert.Equal(["CAT III"], whatIf.Select(s => s.GetAttribute("data-best")));
        Assert.Contains("07L what-if", directions[0].QuerySelector("[data-testid=whatif-capability-alternative] .cap-band-name")!.TextContent, StringComparison.Ordinal);
    }
}
