using Bunit;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Review;
using OpsLvp.Web.Components.Review;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Review;

/// <summary>The review page's capability rows (docs/capability.md) from recorded capability_changed events. Facilities and reasons invented.</summary>
public sealed class CapabilityTimelineTableTests : LiveComponentTest
{
    private static readonly DateTimeOffset T0 = new(2026, 12, 1, 22, 30, 0, TimeSpan.Zero);

    private static RunwayCapability Direction(OperationKind best, bool cat3) => new("07L", true, best, false, false,
    [
        new OperationCapability(OperationKind.CatI, true, []),
        new OperationCapability(OperationKind.CatIII, cat3, cat3 ? [] :
            [new CapabilityReason(ReasonKind.FacilityUnserviceable, "tdzl-07l", "TDZ lights 07L", "circuit 3 tripped (invented)")]),
    ]);

    [Fact]
    public void ShowsEachChangedDirection_WithBeforeAfterAndWhatIsNotAvailable()
    {
        var events = new[]
        {
            RecordedEvent.FromEvent(new CapabilityChanged(T0, [Direction(OperationKind.CatIII, true)], [Direction(OperationKind.CatI, false)])),
        };

        var cut = Render<CapabilityTimelineTable>(p => p.Add(c => c.Events, events));

        var row = cut.Find("[data-testid=review-capability-row][data-direction='07L']");
        Assert.Contains("22:30:00Z", row.TextContent, StringComparison.Ordinal);
        Assert.Contains("07L CAT III", row.TextContent, StringComparison.Ordinal);
        Assert.Equal("07L CAT I", row.QuerySelector("[data-testid=review-capability-after]")!.TextContent.Trim());
        Assert.Equal("CAT III: TDZ lights 07L unserviceable (circuit 3 tripped (invented))", row.QuerySelector("[data-testid=review-capability-reasons]")!.TextContent.Trim());
    }

    [Fact]
    public void NoChange_SaysSo_AndABrokenEventIsReportedNotThrown()
    {
        var none = Render<CapabilityTimelineTable>(p => p.Add(c => c.Events, []));
        Assert.NotNull(none.Find("[data-testid=review-capability-none]"));

        var broken = Render<CapabilityTimelineTable>(p => p.Add(c => c.Events,
            [new RecordedEvent(T0, "capability_changed", """{"event":"capability_changed","time":"2026-12-01T22:30:00Z"}""")]));
        Assert.Contains("has no 'directions' array", broken.Find("[data-testid=review-capability-error]").TextContent, StringComparison.Ordinal);
    }
}
