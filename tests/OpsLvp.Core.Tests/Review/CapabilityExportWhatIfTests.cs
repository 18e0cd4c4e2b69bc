using CsCheck;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Core.Tests.Capability;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Review;

/// <summary>
/// Capability in episode exports (carried facility status and direction in use, export → replay gives the recorded
/// capability) and what-if with changed operations (docs/capability.md "Review", "What-if"). The night, its readings and
/// names are invented; minima as in <see cref="CapabilityTestProfiles"/> (CAT II TDZ 300 m: ICAO Annex 6, from memory).
/// </summary>
public sealed class CapabilityExportWhatIfTests
{
    private static readonly DateTimeOffset T0 = TestProfiles.T0;
    private static readonly AerodromeProfile Profile = Valid(CapabilityEngineTests.Profile());

    /// <summary>The engine tests' profile made valid for the profile validator (a what-if validates its edit): the extinction age its forward-scatter sensor needs, 120 s (invented).</summary>
    private static AerodromeProfile Valid(AerodromeProfile p)
    {
        var ages = p.MaxAgeSeconds.ToDictionary();
        ages.TryAdd(ReadingKind.Extinction, 120);
        var valid = p with { MaxAgeSeconds = ages };
        var result = ProfileValidator.Validate(valid);
        return result.IsValid ? valid : throw new ProfileException(result.Problems);
    }

    /// <summary>Clear (2000 m) until 120 min, then fog at <paramref name="fogM"/> at every position until 180 min; readings every minute.</summary>
    private static List<Reading> Night(double fogM)
    {
        var readings = new List<Reading>();
        for (var m = 0; m <= 180; m++)
        {
            var rvr = m < 120 ? 2000 : fogM;
            var at = T0.AddMinutes(m);
            readings.Add(new Reading(at, "RVR07T", ReadingKind.Rvr, rvr));
            readings.Add(new Reading(at, "RVR07M", ReadingKind.Rvr, rvr));
            readings.Add(new Reading(at, "RVR25T", ReadingKind.Rvr, rvr));
            readings.Add(new Reading(at, "CEIL1", ReadingKind.CloudBase, 5000));
        }
        return readings;
    }

    /// <summary>
    /// The recorded night: the 07 TDZ lights reported unserviceable at 1 min and runway 07/25 turned to 25 at 2 min,
    /// long before the episode's lead-in; the export of its episode.
    /// </summary>
    private static EpisodeExport Recorded(double fogM, bool turnTo25 = true)
    {
        var readings = Night(fogM);
        var actions = new List<TimedCommand>
        {
            new(T0.AddMinutes(1), new SetFacilityStatus("ash (invented)", "tdzl-07", FacilityStatus.Unserviceable, "circuit fault (invented)", "lighting")),
        };
        if (turnTo25)
        {
            actions.Add(new(T0.AddMinutes(2), new SetRunwayInUse("dm (invented)", "07/25", "25", "wind (invented)")));
        }
        var events = ReplayRunner.Run(Profile, readings, actions, T0.AddMinutes(180)).Events.Select(RecordedEvent.FromEvent).ToList();
        var episode = EpisodeModel.Build(events, readings, T0.AddMinutes(180)).Single();
        var export = EpisodeExport.Create(episode, Profile, readings, events, []);
        Assert.True(T0.AddMinutes(2) < export.From, $"the commands must precede the export ({export.From:O})");
        return export;
    }

    private static IReadOnlyList<CapabilityBand> ReplayedBands(EpisodeExport export, AerodromeProfile? profile = null)
    {
        var events = export.Replay(profile).Events.Select(RecordedEvent.FromEvent).ToList();
        return CapabilityBands.Of(CapabilityBands.StatesBefore([], events, export.Start), events, export.Start, export.ReplayUntil);
    }

    private static IEnumerable<(DateTimeOffset, DateTimeOffset, string, bool)> Flat(IEnumerable<CapabilityBand> bands) =>
        bands.SelectMany(b => b.Segments.Select(s => (s.Start, s.End, s.State.Headline, s.State.InUse)));

    [Fact]
    public void ExportCarriesFacilityStatusAndDirectionSetBeforeIt_AndItsReplayGivesTheRecordedCapability()
    {
        var export = Recorded(fogM: 350);
        var parsed = EpisodeExport.Parse(export.ToJson());

        var carried = parsed.Actions.Where(a => a.Time == export.From).ToList();
        Assert.Equal([("facility", "tdzl-07", "unserviceable:lighting"), ("runway_in_use", "07/25", "25")], carried.Select(a => (a.Action, a.Target, a.Value)));
        Assert.StartsWith("(set 2026-12-01T03:01:00Z) circuit fault (invented)", carried[0].Reason, StringComparison.Ordinal);
        var recorded = export.CapabilityBandsRecorded(export.Start, export.ReplayUntil);
        // recorded: 25 in use; on 07 the TDZ lights keep CAT III away, CAT II (TDZ ≥ 300 m) is the best in 350 m fog
        Assert.Equal(["25", "07"], recorded.Select(b => b.Direction));
        Assert.Equal("07 CAT II, LVTO available", recorded[1].Segments[^1].State.Headline);
        Assert.Equal(Flat(recorded), Flat(ReplayedBands(parsed)));
        Assert.Equal(Flat(recorded), Flat(parsed.CapabilityBandsRecorded(export.Start, export.ReplayUntil)));
    }

    [Fact]
    public void ExportJsonAndCsv_CarryTheCapabilityAtStartAndEachChange()
    {
        var export = Recorded(fogM: 350);

        var json = export.ToJson();
        var csv = CapabilityExport.Csv(EpisodeExport.Parse(json));

        Assert.Contains("\"capability_at_start\": [", json, StringComparison.Ordinal);
        var atStart = EpisodeExport.Parse(json).CapabilityAtStart;
        Assert.Equal([("07", false, "CAT I"), ("25", true, "CAT I")], atStart.Select(s => (s.Direction, s.InUse, s.Best)));
        Assert.Contains("CAT III: TDZ lights 07 unserviceable (circuit fault (invented))", atStart[0].NotAvailable);
        var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(CapabilityExport.CsvHeader, lines[0]);
        Assert.StartsWith($"{ReviewCsv.Time(export.From)},07,false,at_start,,,CAT I,LVTO not available,", lines[1], StringComparison.Ordinal);
        Assert.Contains(lines, l => l.Contains(",07,false,change,", StringComparison.Ordinal) && l.Contains(",CAT II,LVTO available,", StringComparison.Ordinal));
        Assert.Equal(export.CapabilityChanges().Count + 2, lines.Length - 1);
    }

    [Fact]
    public void CarryOver_LeavesOutWhatWasBackToNormalBeforeTheExport()
    {
        var events = new[]
        {
            Manual(1, "facility", "TDZ lights 07 (tdzl-07) unserviceable", "fault (invented)"),
            Manual(5, "facility", "TDZ lights 07 (tdzl-07) serviceable", "fixed (invented)"),
            Manual(6, "runway_in_use", "runway 07/25: 25 in use", "wind (invented)"),
            Manual(7, "runway_in_use", "runway 07/25: 07 in use", "wind (invented)"),
            Manual(8, "facility", "Standby power (power) degraded", "one set (invented)"),
            Manual(30, "facility", "Stop bars 07 (sb-07) unserviceable", "after the cut (invented)"),
        };

        var rows = CapabilityCarryOver.Rows(events, Profile, T0.AddMinutes(20));

        var row = Assert.Single(rows);
        Assert.Equal((T0.AddMinutes(20), "facility", "power", "degraded"), (row.Time, row.Action, row.Target, row.Value));
    }

    private static RecordedEvent Manual(double minutes, string action, string detail, string reason) =>
        RecordedEvent.FromEvent(new ManualActionApplied(T0.AddMinutes(minutes), "dm (invented)", action, detail, reason));

    [Theory]
    [InlineData(350, "CAT II")]          // exactly at the changed minimum: met (docs/capability.md "at or above")
    [InlineData(351, "no CAT approach")] // one metre above the RVR: CAT II lost, and CAT I needs 550 m
    public void WhatIf_RaisedCatIIMinimum_AtTheBoundary(double minimumM, string best)
    {
        var export = Recorded(fogM: 350);
        var catII = Profile.Capability!.Operations.Single(o => o.Direction == "07" && o.Kind == OperationKind.CatII);
        var edited = WhatIf.WithOperation(export.Profile, catII with { Rvr = [new(RvrPosition.Tdz, minimumM), new(RvrPosition.Mid, CapabilityTestProfiles.CatIIMidM)] });

        var result = WhatIf.Run(export, edited);

        Assert.Equal("CAT II", result.ActualCapability.Single(b => b.Direction == "07").Segments[^1].State.Best);
        var alt = result.AlternativeCapability.Single(b => b.Direction == "07").Segments[^1].State;
        Assert.Equal(best, alt.Best);
        if (best != "CAT II")
        {
            Assert.Contains("CAT II: RVR TDZ 350 m below the 351 m this operation needs", alt.NotAvailable);
        }
        Assert.Equal(300, catII.Rvr[0].MinimumM); // the export's profile is not touched
    }

    [Fact]
    public void WhatIf_CatIIINoLongerNeedingTheTdzLights_IsAvailable_SideBySideWithTheRecordedCatII()
    {
        var export = Recorded(fogM: 350);
        var catIII = Profile.Capability!.Operations.Single(o => o.Direction == "07" && o.Kind == OperationKind.CatIII);

        var result = WhatIf.Run(export, WhatIf.WithOperation(export.Profile, catIII with { Facilities = catIII.Facilities.Where(f => f != "tdzl-07").ToList() }));

        Assert.Equal("07 CAT II, LVTO available", result.ActualCapability.Single(b => b.Direction == "07").Segments[^1].State.Headline);
        Assert.Equal("07 CAT III, LVTO available", result.AlternativeCapability.Single(b => b.Direction == "07").Segments[^1].State.Headline);
        Assert.Equal(result.ActualCapability.Select(b => b.Direction), result.AlternativeCapability.Select(b => b.Direction));
    }

    [Fact]
    public void WhatIf_SameProfile_GivesTheRecordedCapability()
    {
        var export = Recorded(fogM: 350);

        var result = WhatIf.Run(export, export.Profile);

        Assert.NotEmpty(result.ActualCapability);
        Assert.Equal(Flat(result.ActualCapability), Flat(result.AlternativeCapability));
    }

    [Fact]
    public void WithOperation_Invalid_NamesTheProblem()
    {
        var catII = Profile.Capability!.Operations.Single(o => o.Direction == "07" && o.Kind == OperationKind.CatII);

        var unknown = Assert.Throws<ProfileException>(() => WhatIf.WithOperation(Profile, catII with { Facilities = ["no-such-facility"] }));
        var missing = Assert.Throws<ProfileException>(() => WhatIf.WithOperation(Profile, catII with { Direction = "25" }));
        var none = Assert.Throws<ProfileException>(() => WhatIf.WithOperation(TestProfiles.Standard(), catII));

        Assert.Contains("capability.operations", unknown.Message, StringComparison.Ordinal);
        Assert.Contains("25 offers no CAT II", missing.Message, StringComparison.Ordinal);
        Assert.Contains("no capability section", none.Message, StringComparison.Ordinal);
    }

    private static readonly string[] FacilityIds = CapabilityTestProfiles.Runway07().Facilities.Select(f => f.Id).ToArray();

    private static readonly Gen<CapabilityInputs> GenInputs =
        Gen.Select(
            Gen.Int[0, 2].Array[FacilityIds.Length],
            Gen.OneOf(Gen.Const((double?)null), Gen.Int[50, 2000].Select(v => (double?)v)).Array[3],
            Gen.Int[0, 2].Select(i => new[] { LvpStanding.InForce, LvpStanding.NotInForce, LvpStanding.SafeguardsIncomplete }[i]),
            (statuses, rvr, lvp) =>
            {
                var facilities = new Dictionary<string, FacilityState>();
                for (var i = 0; i < FacilityIds.Length; i++)
                {
                    if (statuses[i] > 0)
                    {
                        facilities[FacilityIds[i]] = CapabilityTestProfiles.Status(statuses[i] == 1 ? FacilityStatus.Degraded : FacilityStatus.Unserviceable);
                    }
                }
                return CapabilityTestProfiles.Inputs(CapabilityTestProfiles.Rvr07(rvr[0], rvr[1], rvr[2]), lvp, facilities);
            });

    private static bool Available(IReadOnlyList<RunwayCapability> caps, OperationConfig op) =>
        caps.Single(c => c.Direction == op.Direction).Operations.Single(o => o.Kind == op.Kind).Available;

    [Fact]
    public void Property_RaisingAMinimum_NeverMakesAnOperationAvailableWhereItWasNot()
    {
        var ops = Profile.Capability!.Operations;
        Gen.Select(GenInputs, Gen.Int[0, ops.Count - 1], Gen.Int[0, 400].Array[3]).Sample((inputs, index, raise) =>
        {
            var op = ops[index];
            var raised = op with { Rvr = op.Rvr.Select((m, i) => m with { MinimumM = Math.Min(2000, m.MinimumM + raise[i]) }).ToList() };
            var edited = WhatIf.WithOperation(Profile, raised).Capability!;
            var before = CapabilityEvaluator.Evaluate(Profile.Capability, inputs);
            var after = CapabilityEvaluator.Evaluate(edited, inputs);
            foreach (var o in ops)
            {
                Assert.True(!Available(after, o) || Available(before, o), $"{o.Direction} {o.Kind} became available");
            }
        }, iter: 300);
    }

    [Fact]
    public void Property_RemovingAFacilityRequirement_NeverMakesAnOperationUnavailable()
    {
        var ops = Profile.Capability!.Operations;
        Gen.Select(GenInputs, Gen.Int[0, ops.Count - 1], Gen.Bool.Array[8]).Sample((inputs, index, keep) =>
        {
            var op = ops[index];
            var kept = op.Facilities.Where((_, i) => keep[i % keep.Length]).ToList();
            var reduced = op with { Facilities = kept, AcceptDegraded = op.AcceptDegraded?.Where(kept.Contains).ToList() };
            var edited = WhatIf.WithOperation(Profile, reduced).Capability!;
            var before = CapabilityEvaluator.Evaluate(Profile.Capability, inputs);
            var after = CapabilityEvaluator.Evaluate(edited, inputs);
            foreach (var o in ops)
            {
                Assert.True(!Available(before, o) || Available(after, o), $"{o.Direction} {o.Kind} became unavailable");
            }
        }, iter: 300);
    }
}
