using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Review;

namespace OpsLvp.Core.Tests.Review;

/// <summary>Capability bands per runway direction from recorded capability_changed events (docs/capability.md "Review"). Facilities and reasons invented.</summary>
public sealed class CapabilityBandsTests
{
    private static readonly DateTimeOffset T0 = new(2026, 12, 1, 22, 0, 0, TimeSpan.Zero);

    private static RunwayCapability Full(string direction, bool inUse) => new(direction, inUse, OperationKind.CatIII, true, true,
    [
        new OperationCapability(OperationKind.CatI, true, []),
        new OperationCapability(OperationKind.CatIII, true, []),
        new OperationCapability(OperationKind.Lvto, true, []),
    ]);

    private static RunwayCapability TdzLightsOut(string direction, bool inUse) => new(direction, inUse, OperationKind.CatI, true, false,
    [
        new OperationCapability(OperationKind.CatI, true, []),
        new OperationCapability(OperationKind.CatIII, false,
            [new CapabilityReason(ReasonKind.FacilityUnserviceable, "tdzl-07l", "TDZ lights 07L", "circuit 3 tripped (invented)")]),
        new OperationCapability(OperationKind.Lvto, false, [new CapabilityReason(ReasonKind.LvpNotInForce, null, null, null)]),
    ]);

    private static RecordedEvent Changed(double minutes, IReadOnlyList<RunwayCapability> before, IReadOnlyList<RunwayCapability> after) =>
        RecordedEvent.FromEvent(new CapabilityChanged(T0.AddMinutes(minutes), before, after));

    [Fact]
    public void SegmentsPerDirection_InUseFirst_LabelledInWords_WithTheFirstReason()
    {
        var events = new[]
        {
            Changed(0, [], [Full("07R", false), Full("07L", true)]),
            Changed(30, [Full("07R", false), Full("07L", true)], [Full("07R", false), TdzLightsOut("07L", true)]),
            Changed(80, [Full("07R", false), TdzLightsOut("07L", true)], [Full("07R", false), Full("07L", true)]),
        };

        var bands = CapabilityBands.Of([], events, T0, T0.AddMinutes(120));

        Assert.Equal(["07L", "07R"], bands.Select(b => b.Direction)); // the direction in use first, though recorded second
        var l = bands[0];
        Assert.True(l.InUse);
        Assert.Equal(
            [(0.0, 30.0, "CAT III", "LVTO available"), (30.0, 80.0, "CAT I", "LVTO not available"), (80.0, 120.0, "CAT III", "LVTO available")],
            l.Segments.Select(s => ((s.Start - T0).TotalMinutes, (s.End - T0).TotalMinutes, s.State.Best, s.State.Lvto)));
        Assert.Equal("CAT III: TDZ lights 07L unserviceable (circuit 3 tripped (invented))", l.Segments[1].State.FirstReason);
        Assert.Equal(["CAT III: TDZ lights 07L unserviceable (circuit 3 tripped (invented))", "LVTO: not LVP in force"], l.Segments[1].State.NotAvailable);
        Assert.Equal("07L CAT I, LVTO not available", l.Segments[1].State.Headline);
        Assert.Equal("", l.Segments[0].State.FirstReason);
        var r = Assert.Single(bands[1].Segments);
        Assert.Equal((T0, T0.AddMinutes(120), "CAT III"), (r.Start, r.End, r.State.Best));
    }

    [Fact]
    public void StateBeforeTheWindow_StartsTheBand_AndChangesBeforeItAreNotChanges()
    {
        var events = new[]
        {
            Changed(0, [], [Full("07L", true)]),
            Changed(10, [Full("07L", true)], [TdzLightsOut("07L", true)]),
            Changed(50, [TdzLightsOut("07L", true)], [Full("07L", true)]),
        };
        var from = T0.AddMinutes(20);

        var atStart = CapabilityBands.StatesBefore([], events, from);
        var bands = CapabilityBands.Of(atStart, events, from, T0.AddMinutes(60));
        var changes = CapabilityBands.Changes(atStart, events, from, T0.AddMinutes(60));

        Assert.Equal("CAT I", Assert.Single(atStart).Best);
        Assert.Equal([(20.0, 50.0, "CAT I"), (50.0, 60.0, "CAT III")], bands.Single().Segments.Select(s => ((s.Start - T0).TotalMinutes, (s.End - T0).TotalMinutes, s.State.Best)));
        var change = Assert.Single(changes);
        Assert.Equal(("CAT I", "CAT III"), (change.Before!.Best, change.After.Best));
    }

    [Fact]
    public void WithoutAnyStateBeforeIt_ABandStartsAtTheFirstRecordedCapability_AndNoCapabilityGivesNoBand()
    {
        var bands = CapabilityBands.Of([], [Changed(15, [], [Full("07L", true)])], T0, T0.AddMinutes(60));

        Assert.Equal(T0.AddMinutes(15), bands.Single().Segments.Single().Start);
        Assert.Empty(CapabilityBands.Of([], [], T0, T0.AddMinutes(60)));
    }

    [Fact]
    public void NoApproachAvailable_IsWordedAsTheWallWordsIt()
    {
        var none = new RunwayCapability("25R", true, null, false, false,
            [new OperationCapability(OperationKind.CatI, false, [new CapabilityReason(ReasonKind.RvrPositionSilent, null, null, null, Position: RvrPosition.Tdz)])]);

        var state = CapabilityBands.StatesOf(Changed(0, [], [none])).Single();

        Assert.Equal(("no CAT approach", "", "CAT I: RVR TDZ sensor silent"), (state.Best, state.Lvto, state.FirstReason));
        Assert.Equal(OpsLvp.Core.Presentation.CapabilityWords.Summary(none), state.Headline);
    }
}
