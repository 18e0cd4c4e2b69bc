using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>
/// docs/engine.md R30–R37 through the engine: facility reports, runway in use, observer RVR, capability_changed events
/// and the downgrade alarm. Profile: the engine tests' invented XDMO with <see cref="CapabilityTestProfiles.Runway07"/>;
/// LVP enter active below 550 m RVR after 30 s (invented, <see cref="TestProfiles"/>).
/// </summary>
public class CapabilityEngineTests
{
    private const string Dm = "dm (invented)";

    public static AerodromeProfile Profile() => TestProfiles.Standard() with { Capability = CapabilityTestProfiles.Runway07() };

    private static RunwayCapability Cap(EngineDriver d, string direction = "07") => d.State.Capability!.Single(c => c.Direction == direction);

    /// <summary>RVR at 07 TDZ, MID, END (RVR07T, RVR07M, RVR25T) and a high ceiling at T0 + seconds.</summary>
    private static EngineInput[] Rvr(double seconds, double tdz, double mid, double end) =>
    [
        EngineDriver.Rvr(seconds, "RVR07T", tdz), EngineDriver.Rvr(seconds, "RVR07M", mid), EngineDriver.Rvr(seconds, "RVR25T", end), EngineDriver.Ceiling(seconds, 5000),
    ];

    /// <summary>LVP in force at 400 m everywhere from 0 s to <paramref name="until"/> s, readings every 60 s.</summary>
    private static EngineDriver InForce(double until = 120)
    {
        var d = new EngineDriver(Profile());
        for (var t = 0; t <= until; t += 60)
        {
            d.Run(t, Rvr(t, 400, 400, 400));
        }
        Assert.Equal(Phase.Active, d.State.Phase);
        return d;
    }

    [Fact]
    public void FirstEvaluation_RecordsTheCapability()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Rvr(0, 2000, 2000, 2000));

        var changed = Assert.Single(d.Events.OfType<CapabilityChanged>());
        Assert.Empty(changed.Before);
        Assert.Equal(OperationKind.CatI, Cap(d).BestApproach); // LVP not in force yet: CAT II/III and LVTO need them
        Assert.Equal(ReasonKind.LvpNotInForce, Cap(d).Operations.Single(o => o.Kind == OperationKind.CatIII).Reasons.Single().Kind);
        Assert.Equal(["07", "25"], d.Engine.Describe(d.State, EngineDriver.At(0)).Capability!.Select(c => c.Direction));
    }

    [Fact]
    public void WithoutACapabilitySection_NothingChanges()
    {
        var d = new EngineDriver();
        d.Run(0, Rvr(0, 400, 400, 400));

        Assert.Null(d.State.Capability);
        Assert.Empty(d.Events.OfType<CapabilityChanged>());
    }

    [Fact]
    public void LvpInForce_UpgradesToCatIII_AtTheTransitionInstant()
    {
        var d = InForce();

        var entered = d.Transitions.Single(t => t.To == Phase.Active).At;
        var last = d.Events.OfType<CapabilityChanged>().Last();
        Assert.Equal(entered, last.At);
        Assert.Equal(OperationKind.CatIII, Cap(d).BestApproach);
        Assert.True(Cap(d).LvtoAvailable);
    }

    [Fact]
    public void SafeguardsIncomplete_IsTheReason_WhileConditionsAreMet()
    {
        var d = new EngineDriver(Profile() with { InForceNeedsSafeguards = true });
        for (var t = 0; t <= 120; t += 60)
        {
            d.Run(t, Rvr(t, 400, 400, 400));
        }

        Assert.Equal(Phase.Preparation, d.State.Phase);
        Assert.Equal(ReasonKind.LvpSafeguardsIncomplete, Cap(d).Operations.Single(o => o.Kind == OperationKind.CatII).Reasons.Single().Kind);
    }

    [Fact]
    public void TdzLightFault_DowngradesTheRunwayInUse_RaisesTheAlarm_ClearingRestoresIt()
    {
        var d = InForce();
        d.Run(150, new SetFacilityStatus("ash (invented)", "tdzl-07", FacilityStatus.Unserviceable, "cable fault (invented)", "lighting"));

        Assert.Equal(OperationKind.CatII, Cap(d).BestApproach);
        var applied = d.Events.OfType<ManualActionApplied>().Last();
        Assert.Equal("facility", applied.Action);
        Assert.Equal("cable fault (invented)", applied.Reason);
        var alarm = Assert.Single(d.State.Alarms, a => a.Kind == AlarmKind.CapabilityDowngrade);
        Assert.Equal("capability-down:07", alarm.Key);
        Assert.Equal("runway 07 in use down from 07 CAT III, LVTO available to 07 CAT II, LVTO available", alarm.Message);

        d.Run(160, new AcknowledgeAlarm(Dm, alarm.Key));
        Assert.True(d.State.Alarms.Single(a => a.Key == alarm.Key).Acknowledged);

        d.Run(170, new SetFacilityStatus("ash (invented)", "tdzl-07", FacilityStatus.Serviceable, "repaired (invented)", "lighting"));
        Assert.Equal(OperationKind.CatIII, Cap(d).BestApproach);
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.CapabilityDowngrade);
        Assert.Contains(d.Events.OfType<AlarmCleared>(), c => c.Key == alarm.Key && c.At == EngineDriver.At(170));
    }

    [Fact]
    public void ADowngradeOfADirectionNotInUse_RaisesNoAlarm()
    {
        var d = InForce();
        d.Run(150, new SetFacilityStatus(Dm, "cl-07", FacilityStatus.Unserviceable, "fault (invented)"));

        Assert.Null(Cap(d, "25").BestApproach); // 25 CAT I needs the centreline lights (invented)
        Assert.DoesNotContain(d.State.Alarms, a => a.Key == "capability-down:25");
        Assert.Contains(d.State.Alarms, a => a.Key == "capability-down:07");
    }

    [Fact]
    public void ATeamReportsOnlyItsOwnFacilities()
    {
        var d = InForce();
        var events = d.Run(150, new SetFacilityStatus("kim (invented)", "tdzl-07", FacilityStatus.Unserviceable, "fault (invented)", "airside"));

        var refused = Assert.Single(events.OfType<CommandRefused>());
        Assert.Equal("facility tdzl-07 is reported by team lighting, not airside", refused.Reason);
        Assert.Equal(OperationKind.CatIII, Cap(d).BestApproach);
    }

    [Theory]
    [InlineData("", "a reason is required to report a facility's status")]
    [InlineData("x", null)]
    public void AFacilityReportNeedsAReason(string reason, string? refusal)
    {
        var d = InForce();
        var events = d.Run(150, new SetFacilityStatus(Dm, "sb-07", FacilityStatus.Degraded, reason));

        Assert.Equal(refusal, events.OfType<CommandRefused>().SingleOrDefault()?.Reason);
    }

    [Fact]
    public void UnknownFacility_IsRefused()
    {
        var d = InForce();
        var events = d.Run(150, new SetFacilityStatus(Dm, "nowhere", FacilityStatus.Unserviceable, "x"));

        Assert.Equal("unknown facility 'nowhere'", Assert.Single(events.OfType<CommandRefused>()).Reason);
    }

    [Fact]
    public void AnUnserviceableRvrSensorFacility_TakesItsPositionOutOfService()
    {
        var d = InForce();
        d.Run(150, new SetFacilityStatus(Dm, "rvr-07t", FacilityStatus.Unserviceable, "lamp (invented)"));

        var reasons = Cap(d).Operations.Single(o => o.Kind == OperationKind.CatI).Reasons;
        Assert.Equal(ReasonKind.RvrPositionOutOfService, reasons.Single().Kind);
        Assert.Null(Cap(d).BestApproach);
    }

    [Fact]
    public void RunwayInUse_MovesGoverningPositionsAndCapabilityAtOnce()
    {
        var d = InForce();
        d.Run(150, new SetRunwayInUse(Dm, "07/25", "25", "wind change (invented)"));

        var status = d.Engine.Describe(d.State, EngineDriver.At(150));
        Assert.Equal("25", status.Runways.Single(r => r.RunwayId == "07/25").Direction);
        Assert.Equal("RVR25T", status.Runways.Single(r => r.RunwayId == "07/25").Positions.Single(p => p.Position == RvrPosition.Tdz).SensorId);
        Assert.Equal("25", status.DirectionsInUse["07/25"]);
        Assert.StartsWith("25 ", status.GoverningRvr!.Label, StringComparison.Ordinal); // governing positions follow (docs/engine.md R3, R34)
        Assert.Equal(["25", "07"], d.State.Capability!.Select(c => c.Direction));
        Assert.True(Cap(d, "25").InUse);
        Assert.Equal("runway_in_use", d.Events.OfType<ManualActionApplied>().Last().Action);
        Assert.Contains(d.Events.OfType<CapabilityChanged>(), c => c.At == EngineDriver.At(150));
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.CapabilityDowngrade); // a direction change is not a downgrade
    }

    [Fact]
    public void RunwayInUse_UnknownDirectionOrBlankReason_IsRefused()
    {
        var d = InForce();

        Assert.Equal("'09' is not a direction of runway 07/25 (07, 25)", d.Run(150, new SetRunwayInUse(Dm, "07/25", "09", "x")).OfType<CommandRefused>().Single().Reason);
        Assert.Equal("a reason is required to change the runway in use", d.Run(151, new SetRunwayInUse(Dm, "07/25", "25", " ")).OfType<CommandRefused>().Single().Reason);
        Assert.Equal("07 is already the direction in use of runway 07/25", d.Run(152, new SetRunwayInUse(Dm, "07/25", "07", "x")).OfType<CommandRefused>().Single().Reason);
    }

    [Fact]
    public void ObserverRvr_IsRefusedWhileTheSensorIsFresh()
    {
        var d = InForce();
        var events = d.Run(150, new EnterObserverRvr(Dm, "07", RvrPosition.Tdz, 600, "sam (invented)"));

        Assert.Equal("the 07 TDZ sensor is reporting (400 m); an observer's RVR never replaces a fresh sensor value", events.OfType<CommandRefused>().Single().Reason);
    }

    [Fact]
    public void ObserverRvr_StandsInForASilentSensor_UntilItsMaximumAge()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Rvr(0, 800, 800, 800));
        d.Run(60, EngineDriver.Rvr(60, "RVR07M", 800), EngineDriver.Rvr(60, "RVR25T", 800)); // RVR07T says nothing more
        d.Run(130);
        Assert.Equal(ReasonKind.RvrPositionSilent, Cap(d).Operations.Single(o => o.Kind == OperationKind.CatI).Reasons.Single().Kind);
        Assert.Null(Cap(d).BestApproach);

        d.Run(140, new EnterObserverRvr(Dm, "07", RvrPosition.Tdz, 600, "sam (invented)", "edge lights counted (invented)"));

        var cat1 = Cap(d).Operations.Single(o => o.Kind == OperationKind.CatI);
        Assert.True(cat1.Available);
        Assert.True(cat1.UsesObserverRvr);
        Assert.Equal("observer_rvr", d.Events.OfType<ManualActionApplied>().Last().Action);
        Assert.Equal("RVR 07 TDZ 600 m (observer sam (invented))", d.Events.OfType<ManualActionApplied>().Last().Detail);

        d.Run(2000); // observer max age 600 s (invented): stale at 740 s exactly
        var expired = d.Events.OfType<CapabilityChanged>().Last();
        Assert.Equal(EngineDriver.At(740), expired.At);
        Assert.Null(Cap(d).BestApproach);
    }

    [Fact]
    public void AFreshSensorValue_WinsOverAnEarlierObserverValue()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Rvr(0, 800, 800, 800));
        d.Run(130, EngineDriver.Rvr(130, "RVR07M", 800), EngineDriver.Rvr(130, "RVR25T", 800));
        d.Run(140, new EnterObserverRvr(Dm, "07", RvrPosition.Tdz, 600, "sam (invented)"));
        d.Run(150, EngineDriver.Rvr(150, "RVR07T", 500));

        var reason = Cap(d).Operations.Single(o => o.Kind == OperationKind.CatI).Reasons.Single();
        Assert.Equal(ReasonKind.RvrBelowMinimum, reason.Kind);
        Assert.Equal(RvrSource.Sensor, reason.Source);
        Assert.Equal(500, reason.ValueM);
    }

    [Fact]
    public void CapabilityState_RoundTripsThroughJson()
    {
        var d = InForce();
        d.Run(150, new SetFacilityStatus(Dm, "tdzl-07", FacilityStatus.Unserviceable, "fault (invented)"), new SetRunwayInUse(Dm, "12/30", "30", "x"));
        var options = new System.Text.Json.JsonSerializerOptions { Converters = { new System.Text.Json.Serialization.JsonStringEnumConverter() } };

        var json = System.Text.Json.JsonSerializer.Serialize(d.State, options);
        var restored = System.Text.Json.JsonSerializer.Deserialize<EngineState>(json, options)!;

        Assert.Equal(json, System.Text.Json.JsonSerializer.Serialize(restored, options));
        Assert.True(CapabilityEvaluator.Same(d.State.Capability, restored.Capability));
        Assert.Equal(d.State.CapabilityDowngrades["07"], restored.CapabilityDowngrades["07"]);
    }
}
