using OpsLvp.Core.Capability;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Profile;
using static OpsLvp.Core.Tests.Capability.CapabilityTestProfiles;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>
/// docs/engine.md R31–R33 by example: every reason at least once, and the boundary at each minimum (RVR equal to the
/// minimum meets it, 1 m less does not). Minima: see <see cref="CapabilityTestProfiles"/> (Annex 6 bands from memory,
/// the rest invented).
/// </summary>
public class CapabilityEvaluatorTests
{
    private static RunwayCapability Direction(CapabilityInputs inputs, string direction = "07") =>
        CapabilityEvaluator.Evaluate(Runway07(), inputs).Single(c => c.Direction == direction);

    private static OperationCapability Op(RunwayCapability c, OperationKind kind) => c.Operations.Single(o => o.Kind == kind);

    [Fact]
    public void GoodConditions_LvpInForce_EveryOperationAvailable_CatIIIIsTheHeadline()
    {
        var c = Direction(Inputs(Rvr07(2000, 2000, 2000)));

        Assert.Equal(OperationKind.CatIII, c.BestApproach);
        Assert.True(c.LvtoOffered);
        Assert.True(c.LvtoAvailable);
        Assert.True(c.InUse);
        Assert.All(c.Operations, o => Assert.Empty(o.Reasons));
        Assert.Equal("07 CAT III, LVTO available", CapabilityWords.Summary(c));
    }

    [Fact]
    public void LvpNotInForce_OnlyCatIWhichNeedsNoLvp()
    {
        var c = Direction(Inputs(Rvr07(2000, 2000, 2000), LvpStanding.NotInForce));

        Assert.Equal(OperationKind.CatI, c.BestApproach);
        Assert.False(c.LvtoAvailable);
        var reason = Assert.Single(Op(c, OperationKind.CatII).Reasons);
        Assert.Equal(ReasonKind.LvpNotInForce, reason.Kind);
        Assert.Equal("not LVP in force", CapabilityWords.Reason(reason));
    }

    [Fact]
    public void SafeguardsIncomplete_SaysSo()
    {
        var c = Direction(Inputs(Rvr07(2000, 2000, 2000), LvpStanding.SafeguardsIncomplete));

        var reason = Assert.Single(Op(c, OperationKind.CatIII).Reasons);
        Assert.Equal(ReasonKind.LvpSafeguardsIncomplete, reason.Kind);
        Assert.Equal("not LVP in force — safeguards incomplete", CapabilityWords.Reason(reason));
    }

    [Fact]
    public void TdzLightsUnserviceable_DowngradesCatIIIToCatII_WithTheReporterReason()
    {
        var facilities = new Dictionary<string, FacilityState> { ["tdzl-07"] = Status(FacilityStatus.Unserviceable, "cable fault (invented)") };
        var c = Direction(Inputs(Rvr07(2000, 2000, 2000), facilities: facilities));

        Assert.Equal(OperationKind.CatII, c.BestApproach);
        var reason = Assert.Single(Op(c, OperationKind.CatIII).Reasons);
        Assert.Equal(new CapabilityReason(ReasonKind.FacilityUnserviceable, "tdzl-07", "TDZ lights 07", "cable fault (invented)"), reason);
        Assert.Equal("TDZ lights 07 unserviceable (cable fault (invented))", CapabilityWords.Reason(reason));
        Assert.Equal("CAT III: TDZ lights 07 unserviceable (cable fault (invented))", CapabilityWords.FirstReason(c));
        Assert.True(c.LvtoAvailable); // LVTO does not need TDZ lights in this invented profile
    }

    [Fact]
    public void DegradedFacility_BlocksUnlessTheOperationAcceptsIt()
    {
        var facilities = new Dictionary<string, FacilityState> { ["power"] = Status(FacilityStatus.Degraded, "one generator (invented)") };
        var c = Direction(Inputs(Rvr07(2000, 2000, 2000), facilities: facilities));

        Assert.True(Op(c, OperationKind.CatIII).Available); // CAT III accepts power degraded (invented)
        var reason = Assert.Single(Op(c, OperationKind.CatII).Reasons);
        Assert.Equal(ReasonKind.FacilityDegraded, reason.Kind);
        Assert.Equal("Standby power degraded (one generator (invented))", CapabilityWords.Reason(reason));
    }

    [Fact]
    public void UnserviceableFacilityAcceptedDegraded_StillBlocks()
    {
        var facilities = new Dictionary<string, FacilityState> { ["power"] = Status(FacilityStatus.Unserviceable) };
        var c = Direction(Inputs(Rvr07(2000, 2000, 2000), facilities: facilities));

        Assert.False(Op(c, OperationKind.CatIII).Available);
        Assert.Equal(OperationKind.CatI, c.BestApproach);
    }

    [Fact]
    public void RvrBelowMinimum_NamesPositionValueAndMinimum()
    {
        var c = Direction(Inputs(Rvr07(150, 2000, 2000)));

        var reason = Op(c, OperationKind.CatII).Reasons.Single();
        Assert.Equal(new CapabilityReason(ReasonKind.RvrBelowMinimum, Position: RvrPosition.Tdz, ValueM: 150, MinimumM: CatIITdzM, Source: RvrSource.Sensor), reason);
        Assert.Equal("RVR TDZ 150 m below the 300 m this operation needs", CapabilityWords.Reason(reason));
    }

    [Fact]
    public void SilentRequiredPosition_MakesTheOperationUnavailable()
    {
        var c = Direction(Inputs(Rvr07(2000, 2000, null)));

        var reason = Op(c, OperationKind.CatIII).Reasons.Single();
        Assert.Equal(ReasonKind.RvrPositionSilent, reason.Kind);
        Assert.Equal("RVR END sensor silent", CapabilityWords.Reason(reason));
        Assert.Equal(OperationKind.CatII, c.BestApproach); // CAT II needs TDZ and MID only
        Assert.False(c.LvtoAvailable);
    }

    [Fact]
    public void OutOfServiceAndMissingSensor_AreTheirOwnReasons()
    {
        var positions = new List<PositionValue>
        {
            new("07", RvrPosition.Tdz, null, RvrSource.Sensor, PositionGap.OutOfService),
        };
        var c = Direction(Inputs(positions));

        var cat1 = Op(c, OperationKind.CatI).Reasons.Single();
        Assert.Equal(ReasonKind.RvrPositionOutOfService, cat1.Kind);
        Assert.Equal("RVR TDZ sensor out of service", CapabilityWords.Reason(cat1));
        var mid = Op(c, OperationKind.CatII).Reasons.Single(r => r.Position == RvrPosition.Mid);
        Assert.Equal(ReasonKind.RvrPositionNoSensor, mid.Kind);
        Assert.Equal("no RVR sensor at MID", CapabilityWords.Reason(mid));
        Assert.Null(c.BestApproach);
        Assert.Equal("no CAT approach", CapabilityWords.BestApproach(c.BestApproach));
    }

    [Fact]
    public void EveryReasonIsListed_NotJustTheFirst()
    {
        var facilities = new Dictionary<string, FacilityState>
        {
            ["ils-07"] = Status(FacilityStatus.Unserviceable),
            ["sb-07"] = Status(FacilityStatus.Degraded),
        };
        var c = Direction(Inputs(Rvr07(100, null, 2000), LvpStanding.NotInForce, facilities));

        Assert.Equal(
            [ReasonKind.FacilityUnserviceable, ReasonKind.FacilityDegraded, ReasonKind.LvpNotInForce, ReasonKind.RvrBelowMinimum, ReasonKind.RvrPositionSilent],
            Op(c, OperationKind.CatIII).Reasons.Select(r => r.Kind));
    }

    [Fact]
    public void UnknownFacility_CountsAsNotMet()
    {
        var profile = Runway07() with
        {
            Operations = [new OperationConfig("07", OperationKind.CatI, ["nowhere"], [], NeedsLvp: false)],
        };
        var c = CapabilityEvaluator.Evaluate(profile, Inputs(Rvr07(2000, 2000, 2000))).Single();

        Assert.Equal(ReasonKind.FacilityUnknown, Op(c, OperationKind.CatI).Reasons.Single().Kind);
    }

    [Theory]
    [InlineData(OperationKind.CatI, RvrPosition.Tdz, CatITdzM)]
    [InlineData(OperationKind.CatII, RvrPosition.Tdz, CatIITdzM)]
    [InlineData(OperationKind.CatII, RvrPosition.Mid, CatIIMidM)]
    [InlineData(OperationKind.CatIII, RvrPosition.Tdz, CatIIITdzM)]
    [InlineData(OperationKind.CatIII, RvrPosition.Mid, CatIIIMidM)]
    [InlineData(OperationKind.CatIII, RvrPosition.End, CatIIIEndM)]
    [InlineData(OperationKind.Lvto, RvrPosition.Tdz, LvtoM)]
    [InlineData(OperationKind.Lvto, RvrPosition.Mid, LvtoM)]
    [InlineData(OperationKind.Lvto, RvrPosition.End, LvtoM)]
    public void AtTheMinimum_Available_OneMetreBelow_NotAvailable(OperationKind kind, RvrPosition position, double minimum)
    {
        static double? At(RvrPosition p, RvrPosition which, double value) => p == which ? value : 2000;

        var atMinimum = Direction(Inputs(Rvr07(At(RvrPosition.Tdz, position, minimum), At(RvrPosition.Mid, position, minimum), At(RvrPosition.End, position, minimum))));
        var below = Direction(Inputs(Rvr07(At(RvrPosition.Tdz, position, minimum - 1), At(RvrPosition.Mid, position, minimum - 1), At(RvrPosition.End, position, minimum - 1))));

        Assert.True(Op(atMinimum, kind).Available);
        var reason = Assert.Single(Op(below, kind).Reasons);
        Assert.Equal(ReasonKind.RvrBelowMinimum, reason.Kind);
        Assert.Equal(position, reason.Position);
        Assert.Equal(minimum - 1, reason.ValueM);
    }

    [Fact]
    public void ObserverRvr_CountsForItsPosition_AndIsLabelled()
    {
        var positions = new List<PositionValue>(Rvr07(2000, 2000, 2000).Where(p => !(p.Direction == "07" && p.Position == RvrPosition.Tdz)))
        {
            new("07", RvrPosition.Tdz, 600, RvrSource.Observer, PositionGap.Silent, "sam (invented)"),
        };
        var c = Direction(Inputs(positions, LvpStanding.NotInForce));

        Assert.True(Op(c, OperationKind.CatI).Available);
        Assert.True(Op(c, OperationKind.CatI).UsesObserverRvr);

        var low = positions.Select(p => p.Source == RvrSource.Observer ? p with { ValueM = 500 } : p).ToList();
        var reason = Op(Direction(Inputs(low, LvpStanding.NotInForce)), OperationKind.CatI).Reasons.Single();
        Assert.Equal("RVR TDZ (observer) 500 m below the 550 m this operation needs", CapabilityWords.Reason(reason));
    }

    [Fact]
    public void DirectionsInUseComeFirst()
    {
        var inputs = Inputs(Rvr07(2000, 2000, 2000)) with { DirectionsInUse = new HashSet<string> { "25" } };
        var list = CapabilityEvaluator.Evaluate(Runway07(), inputs);

        Assert.Equal(["25", "07"], list.Select(c => c.Direction));
        Assert.True(list[0].InUse);
        Assert.False(list[1].InUse);
        Assert.False(list[0].LvtoOffered);
        Assert.Equal("", CapabilityWords.Lvto(list[0]));
    }

    [Fact]
    public void Downgrade_IsALowerCategoryOrLvtoLost()
    {
        var full = Direction(Inputs(Rvr07(2000, 2000, 2000)));
        var noLvto = Direction(Inputs(Rvr07(2000, 2000, 2000), facilities: new Dictionary<string, FacilityState> { ["sb-07"] = Status(FacilityStatus.Unserviceable) }));
        var catI = Direction(Inputs(Rvr07(2000, 2000, 2000), facilities: new Dictionary<string, FacilityState> { ["cl-07"] = Status(FacilityStatus.Unserviceable) }));

        Assert.True(CapabilityEvaluator.IsDowngrade(full, noLvto));
        Assert.Equal(OperationKind.CatI, catI.BestApproach);
        Assert.True(CapabilityEvaluator.IsDowngrade(full, catI));
        Assert.False(CapabilityEvaluator.IsDowngrade(catI, full));
        Assert.False(CapabilityEvaluator.IsDowngrade(noLvto, full));
        Assert.False(CapabilityEvaluator.IsDowngrade(full, full));
        Assert.True(CapabilityEvaluator.Same(CapabilityEvaluator.Evaluate(Runway07(), Inputs(Rvr07(2000, 2000, 2000))), CapabilityEvaluator.Evaluate(Runway07(), Inputs(Rvr07(2000, 2000, 2000)))));
        Assert.False(CapabilityEvaluator.Same([full], [noLvto]));
    }
}
