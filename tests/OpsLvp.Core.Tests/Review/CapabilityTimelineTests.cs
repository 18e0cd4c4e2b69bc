using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Review;

namespace OpsLvp.Core.Tests.Review;

/// <summary>Capability marks read back from recorded capability_changed events (docs/capability.md). Facilities and reasons invented.</summary>
public sealed class CapabilityTimelineTests
{
    private static readonly DateTimeOffset T0 = new(2026, 12, 1, 22, 30, 0, TimeSpan.Zero);

    private static RunwayCapability Cat3Available(string direction) => new(direction, true, OperationKind.CatIII, true, true,
    [
        new OperationCapability(OperationKind.CatI, true, []),
        new OperationCapability(OperationKind.CatIII, true, []),
        new OperationCapability(OperationKind.Lvto, true, []),
    ]);

    private static RunwayCapability TdzLightsOut(string direction) => new(direction, true, OperationKind.CatI, true, true,
    [
        new OperationCapability(OperationKind.CatI, true, []),
        new OperationCapability(OperationKind.CatIII, false,
            [new CapabilityReason(ReasonKind.FacilityUnserviceable, "tdzl-07l", "TDZ lights 07L", "circuit 3 tripped (invented)")]),
        new OperationCapability(OperationKind.Lvto, true, []),
    ]);

    [Fact]
    public void FirstEvaluation_ThenADowngrade_GiveOneMarkPerChangedDirection_WithBeforeAfterAndWhatIsNotAvailable()
    {
        var events = new[]
        {
            RecordedEvent.FromEvent(new CapabilityChanged(T0, [], [Cat3Available("07L"), Cat3Available("07R") with { InUse = false }])),
            RecordedEvent.FromEvent(new CapabilityChanged(T0.AddMinutes(5),
                [Cat3Available("07L"), Cat3Available("07R") with { InUse = false }],
                [TdzLightsOut("07L"), Cat3Available("07R") with { InUse = false }])),
        };

        var marks = CapabilityTimeline.Marks(events);

        Assert.Equal(3, marks.Count);
        Assert.Equal(new CapabilityMark(T0, "07L", true, null, "07L CAT III, LVTO available", []), marks[0] with { NotAvailable = [] });
        Assert.Empty(marks[0].NotAvailable);
        Assert.Equal(("07R", false), (marks[1].Direction, marks[1].InUse));
        var down = marks[2];
        Assert.Equal(T0.AddMinutes(5), down.At);
        Assert.Equal(("07L", "07L CAT III, LVTO available", "07L CAT I, LVTO available"), (down.Direction, down.Before, down.After));
        Assert.Equal(["CAT III: TDZ lights 07L unserviceable (circuit 3 tripped (invented))"], down.NotAvailable);
    }

    [Fact]
    public void OtherEventsAreIgnored_AndABrokenCapabilityEventIsNamed()
    {
        Assert.Empty(CapabilityTimeline.Marks([new RecordedEvent(T0, "transition", """{"event":"transition","time":"2026-12-01T22:30:00Z"}""")]));

        var ex = Assert.Throws<FormatException>(() => CapabilityTimeline.Marks(
            [new RecordedEvent(T0, "capability_changed", """{"event":"capability_changed","time":"2026-12-01T22:30:00Z"}""")]));
        Assert.Contains("has no 'directions' array", ex.Message, StringComparison.Ordinal);
    }
}
