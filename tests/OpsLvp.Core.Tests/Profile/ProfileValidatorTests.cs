using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Profile;

// Rules from docs/engine.md R6–R11; the thresholds below are invented test values, not any aerodrome's.
public sealed class ProfileValidatorTests
{
    private static ValidationProblem Single(AerodromeProfile profile)
    {
        var result = ProfileValidator.Validate(profile);
        return Assert.Single(result.Problems);
    }

    private static void AssertProblem(AerodromeProfile profile, string field, string contains)
    {
        var problem = Single(profile);
        Assert.Equal(field, problem.Field);
        Assert.Contains(contains, problem.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ValidFixture_HasNoProblems()
    {
        var result = ProfileValidator.Validate(ProfileFixtures.Valid());
        Assert.True(result.IsValid, result.ToString());
    }

    [Fact]
    public void RecoverBelowEnter_NamesTheRecoverField()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { RvrRecoverM = 500 });
        AssertProblem(p, "thresholds.active.rvrRecoverM", "below rvrBelowM (550 m)");
    }

    [Fact]
    public void CeilingRecoverBelowEnter_NamesTheCeilingRecoverField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { CeilingRecoverFt = 280 });
        AssertProblem(p, "thresholds.preparation.ceilingRecoverFt", "below ceilingBelowFt (300 ft)");
    }

    [Fact]
    public void RecoverEqualToEnter_IsAllowedBecauseEntryIsStrictAndRecoveryInclusive()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { RvrRecoverM = 550 });
        Assert.True(ProfileValidator.Validate(p).IsValid);
    }

    // --- docs/engine.md R23: thresholds no input can reach

    [Fact]
    public void RvrThresholdAboveTheHighestReportableRvr_IsRefusedNamingTheField()
    {
        // RVR upper reporting limit 2000 m, reported as P2000 (ICAO Annex 3, App 3, §4.3.6; WMO BUFR code table 0 08 014)
        var p = ProfileFixtures.Valid().WithPrep(x => x with { RvrRecoverM = 2100 });
        AssertProblem(p, "thresholds.preparation.rvrRecoverM", "above the highest reportable RVR (2000 m");
    }

    [Fact]
    public void RvrThresholdAtTheHighestReportableRvr_IsAllowed()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { RvrBelowM = 1500, RvrRecoverM = 2000 });
        Assert.True(ProfileValidator.Validate(p).IsValid, ProfileValidator.Validate(p).ToString());
    }

    [Fact]
    public void CeilingThresholdAtTheCeilingLimit_IsRefusedNamingTheField()
    {
        // ceiling: lowest BKN/OVC layer below 20 000 ft (ICAO/EASA definition of ceiling)
        var p = ProfileFixtures.Valid().WithPrep(x => x with { CeilingRecoverFt = 20_000 });
        AssertProblem(p, "thresholds.preparation.ceilingRecoverFt", "at or above the ceiling definition's limit (20000 ft");
    }

    [Fact]
    public void CeilingThresholdJustBelowTheCeilingLimit_IsAllowed()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { CeilingRecoverFt = 19_900 });
        Assert.True(ProfileValidator.Validate(p).IsValid, ProfileValidator.Validate(p).ToString());
    }

    // --- docs/engine.md R18: entry comparison

    [Fact]
    public void AtOrBelowWithRecoverEqualToEntry_IsRefusedNamingTheRecoverField()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { EntryComparison = EntryComparison.AtOrBelow, CeilingRecoverFt = 200 });
        AssertProblem(p, "thresholds.active.ceilingRecoverFt", "equal to ceilingBelowFt with entryComparison atOrBelow");
    }

    [Fact]
    public void AtOrBelowWithRecoverAboveEntry_IsAllowed()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { EntryComparison = EntryComparison.AtOrBelow });
        Assert.True(ProfileValidator.Validate(p).IsValid, ProfileValidator.Validate(p).ToString());
    }

    [Fact]
    public void EntryComparison_IsReadFromTheProfileJsonAndUnknownWordsAreRefused()
    {
        var json = File.ReadAllText(Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo", "profile.json"));
        var atOrBelow = json.Replace("\"active\": {", "\"active\": { \"entryComparison\": \"atOrBelow\",", StringComparison.Ordinal);
        Assert.NotEqual(json, atOrBelow);
        Assert.Equal(EntryComparison.AtOrBelow, ProfileLoader.Parse(atOrBelow).Thresholds.Active.EntryComparison);
        Assert.Equal(EntryComparison.Below, ProfileLoader.Parse(json).Thresholds.Active.EntryComparison);
        var bad = json.Replace("\"active\": {", "\"active\": { \"entryComparison\": \"atOrUnder\",", StringComparison.Ordinal);
        Assert.Throws<ProfileException>(() => ProfileLoader.Parse(bad));
    }

    // --- docs/engine.md R21: maximum age per sensor

    [Fact]
    public void SensorMaxAgeNotPositive_IsRefusedNamingTheField()
    {
        var p = ProfileFixtures.Valid().WithSensor(3, s => s with { MaxAgeSeconds = 0 });
        AssertProblem(p, "sensors[3].maxAgeSeconds", "expected this sensor's maximum reading age in seconds > 0");
    }

    [Fact]
    public void SensorWithItsOwnMaxAge_NeedsNoPerKindValue()
    {
        var valid = ProfileFixtures.Valid();
        var ages = valid.MaxAgeSeconds.Where(p => p.Key is not (ReadingKind.CloudBase or ReadingKind.VerticalVisibility)).ToDictionary();
        Assert.False(ProfileValidator.Validate(valid with { MaxAgeSeconds = ages }).IsValid);
        var p = (valid with { MaxAgeSeconds = ages }).WithSensor(3, s => s with { MaxAgeSeconds = 1800 });
        Assert.True(ProfileValidator.Validate(p).IsValid, ProfileValidator.Validate(p).ToString());
    }

    [Fact]
    public void RecoverMissingWhileEnterSet_NamesTheRecoverField()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { CeilingRecoverFt = null });
        AssertProblem(p, "thresholds.active.ceilingRecoverFt", "is missing while ceilingBelowFt is set");
    }

    [Fact]
    public void PreparationRvrBelowNotAboveActive_NamesThePreparationField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { RvrBelowM = 550 });
        AssertProblem(p, "thresholds.preparation.rvrBelowM", "not above thresholds.active.rvrBelowM (550 m)");
    }

    [Fact]
    public void PreparationCeilingBelowNotAboveActive_NamesThePreparationField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { CeilingBelowFt = 150, CeilingRecoverFt = 400 });
        AssertProblem(p, "thresholds.preparation.ceilingBelowFt", "not above thresholds.active.ceilingBelowFt (200 ft)");
    }

    [Fact]
    public void PreparationRvrRecoverNotAboveActive_NamesThePreparationRecoverField()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { RvrRecoverM = 1200 });
        AssertProblem(p, "thresholds.preparation.rvrRecoverM", "not above thresholds.active.rvrRecoverM (1200 m)");
    }

    [Fact]
    public void PreparationCeilingRecoverNotAboveActive_NamesThePreparationRecoverField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { CeilingRecoverFt = 300 }).WithActive(a => a with { CeilingRecoverFt = 300 });
        AssertProblem(p, "thresholds.preparation.ceilingRecoverFt", "not above thresholds.active.ceilingRecoverFt (300 ft)");
    }

    [Fact]
    public void InputGradedByOnlyOnePhase_NamesTheMissingPhaseField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { CeilingBelowFt = null, CeilingRecoverFt = null });
        AssertProblem(p, "thresholds.preparation.ceilingBelowFt", "expected both phases to grade the same inputs");
    }

    [Fact]
    public void NonPositiveThreshold_NamesTheField()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { RvrBelowM = -5 });
        var result = ProfileValidator.Validate(p);
        Assert.True(result.HasProblemAt("thresholds.active.rvrBelowM"), result.ToString());
    }

    [Fact]
    public void NegativeEnterDwell_NamesTheField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { EnterDwellSeconds = -1 });
        AssertProblem(p, "thresholds.preparation.enterDwellSeconds", "expected 0 or more seconds");
    }

    [Fact]
    public void ZeroEnterDwell_IsAllowed()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { EnterDwellSeconds = 0 });
        Assert.True(ProfileValidator.Validate(p).IsValid);
    }

    [Fact]
    public void ZeroRecoverDwell_NamesTheField()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { RecoverDwellSeconds = 0 });
        AssertProblem(p, "thresholds.active.recoverDwellSeconds", "expected more than 0 seconds");
    }

    [Fact]
    public void NegativeRecoverDwell_NamesTheField()
    {
        var p = ProfileFixtures.Valid().WithPrep(x => x with { RecoverDwellSeconds = -60 });
        AssertProblem(p, "thresholds.preparation.recoverDwellSeconds", "expected more than 0 seconds");
    }

    [Fact]
    public void UnknownRunwayReference_NamesTheSensorRunway()
    {
        var p = ProfileFixtures.Valid().WithSensor(2, s => s with { Runway = "04/22" });
        AssertProblem(p, "sensors[2].runway", "unknown runway '04/22'");
    }

    [Fact]
    public void RvrSensorWithoutRunway_NamesTheSensorRunway()
    {
        var p = ProfileFixtures.Valid().WithSensor(1, s => s with { Runway = null });
        AssertProblem(p, "sensors[1].runway", "is missing");
    }

    [Fact]
    public void RvrSensorWithoutSites_NamesTheSensorSites()
    {
        var p = ProfileFixtures.Valid().WithSensor(1, s => s with { Sites = null });
        AssertProblem(p, "sensors[1].sites", "is missing");
    }

    [Fact]
    public void SiteNamingADirectionTheRunwayLacks_NamesTheSite()
    {
        var p = ProfileFixtures.Valid().WithSensor(0, s => s with { Sites = ProfileFixtures.Sites("09", RvrPosition.Tdz, "28", RvrPosition.End) });
        AssertProblem(p, "sensors[0].sites.28", "has no direction '28'");
    }

    [Fact]
    public void NonRvrSensorOnARunway_NamesTheRunwayField()
    {
        var p = ProfileFixtures.Valid().WithSensor(3, s => s with { Runway = "09/27" });
        AssertProblem(p, "sensors[3].runway", "only RVR sensors");
    }

    [Fact]
    public void TransmissometerWithoutBaseline_NamesTheBaseline()
    {
        var p = ProfileFixtures.Valid().WithSensor(0, s => s with { BaselineM = null });
        AssertProblem(p, "sensors[0].baselineM", "is missing");
    }

    [Fact]
    public void TransmissometerWithZeroBaseline_NamesTheBaseline()
    {
        var p = ProfileFixtures.Valid().WithSensor(0, s => s with { BaselineM = 0 });
        AssertProblem(p, "sensors[0].baselineM", "expected a baseline in metres > 0");
    }

    [Fact]
    public void BaselineOnAForwardScatterMeter_NamesTheBaseline()
    {
        var p = ProfileFixtures.Valid().WithSensor(1, s => s with { BaselineM = 50 });
        AssertProblem(p, "sensors[1].baselineM", "only transmissometers");
    }

    [Fact]
    public void LuminanceSensorNamingANonLuminanceSensor_NamesTheField()
    {
        var p = ProfileFixtures.Valid().WithSensor(0, s => s with { LuminanceSensor = "ceilo" });
        AssertProblem(p, "sensors[0].luminanceSensor", "'ceilo' is not a luminance sensor");
    }

    [Fact]
    public void DuplicateSensorId_NamesTheSecondOne()
    {
        var p = ProfileFixtures.Valid().WithSensor(2, s => s with { Id = "t-09" });
        AssertProblem(p, "sensors[2].id", "duplicate sensor id 't-09'");
    }

    [Fact]
    public void DuplicateRunwayId_NamesTheSecondOne()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Runways = [p.Runways[0], p.Runways[1] with { Id = "09/27" }] };
        AssertProblem(p, "runways[1].id", "duplicate runway id '09/27'");
    }

    [Fact]
    public void DirectionInUseNotOfTheRunway_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Runways = [p.Runways[0] with { DirectionInUse = "36" }, p.Runways[1]] };
        AssertProblem(p, "runways[0].directionInUse", "'36' is not a direction of runway '09/27'");
    }

    [Fact]
    public void RunwayWithoutDirections_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Runways = [p.Runways[0], p.Runways[1] with { Directions = [] }] };
        AssertProblem(p, "runways[1].directions", "is empty");
    }

    [Fact]
    public void DuplicateTeamId_NamesTheSecondOne()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Teams = [p.Teams[0], p.Teams[1], new TeamConfig("ops", "Operations again")] };
        AssertProblem(p, "teams[2].id", "duplicate team id 'ops'");
    }

    [Fact]
    public void BlankTeamName_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Teams = [p.Teams[0], p.Teams[1] with { Name = " " }] };
        AssertProblem(p, "teams[1].name", "is blank");
    }

    [Fact]
    public void UnknownTeamReference_NamesTheItemTeam()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Checklists = p.Checklists with { Preparation = [p.Checklists.Preparation[0], p.Checklists.Preparation[1] with { Team = "catering" }] } };
        AssertProblem(p, "checklists.preparation[1].team", "unknown team 'catering'");
    }

    [Fact]
    public void DuplicateItemIdAcrossPhases_NamesTheLaterItem()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Checklists = p.Checklists with { Cancellation = [p.Checklists.Cancellation[0] with { Id = "p2" }] } };
        AssertProblem(p, "checklists.cancellation[0].id", "duplicate item id 'p2' (also checklists.preparation[1])");
    }

    [Fact]
    public void BlankItemText_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Checklists = p.Checklists with { Active = [p.Checklists.Active[0] with { Text = "" }] } };
        AssertProblem(p, "checklists.active[0].text", "is blank");
    }

    [Fact]
    public void BlankItemId_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Checklists = p.Checklists with { Active = [p.Checklists.Active[0] with { Id = "  " }] } };
        AssertProblem(p, "checklists.active[0].id", "is blank");
    }

    [Fact]
    public void DueWithinZero_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Checklists = p.Checklists with { Active = [p.Checklists.Active[0] with { DueWithinMinutes = 0 }] } };
        AssertProblem(p, "checklists.active[0].dueWithinMinutes", "expected more than 0 minutes");
    }

    [Fact]
    public void CeilingThresholdsWithoutCeilometer_NamesTheCeilingField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Sensors = p.Sensors.Where(s => s.Type != SensorType.Ceilometer).ToList() };
        AssertProblem(p, "thresholds.active.ceilingBelowFt", "no ceilometer is configured");
    }

    [Fact]
    public void CeilometerWithoutCeilingThresholds_IsAllowed()
    {
        var p = ProfileFixtures.Valid()
            .WithPrep(x => x with { CeilingBelowFt = null, CeilingRecoverFt = null })
            .WithActive(a => a with { CeilingBelowFt = null, CeilingRecoverFt = null });
        Assert.True(ProfileValidator.Validate(p).IsValid, ProfileValidator.Validate(p).ToString());
    }

    [Fact]
    public void RvrThresholdsWithoutGoverningSensorOnAnLvpRunway_NamesTheRvrField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Runways = [p.Runways[0] with { Lvp = false }, p.Runways[1]] };
        AssertProblem(p, "thresholds.active.rvrBelowM", "no RVR sensor stands at a governing position");
    }

    [Fact]
    public void MaxAgeMissingForAProducedKind_NamesTheKind()
    {
        var p = ProfileFixtures.Valid();
        p = p with { MaxAgeSeconds = p.MaxAgeSeconds.Where(kv => kv.Key != ReadingKind.Extinction).ToDictionary() };
        AssertProblem(p, "maxAgeSeconds.extinction", "sensor 'f-mid' (forwardScatter) produces extinction");
    }

    [Fact]
    public void MaxAgeMissingForVisibilityFromAnRvrSensor_IsAsked_BecauseTheEngineAcceptsIt()
    {
        // the engine accepts visibility (MOR) from RVR instruments; the validator reads the same table (SensorKinds)
        var p = ProfileFixtures.Valid();
        p = p with { MaxAgeSeconds = p.MaxAgeSeconds.Where(kv => kv.Key != ReadingKind.Visibility).ToDictionary() };
        AssertProblem(p, "maxAgeSeconds.visibility", "sensor 't-09' (transmissometer) produces visibility");
    }

    [Fact]
    public void MaxAgeZero_NamesTheKind()
    {
        var p = ProfileFixtures.Valid();
        p = p with { MaxAgeSeconds = new Dictionary<ReadingKind, int>(p.MaxAgeSeconds) { [ReadingKind.CloudBase] = 0 } };
        AssertProblem(p, "maxAgeSeconds.cloudBase", "expected a maximum reading age in seconds > 0");
    }

    [Fact]
    public void LightsStepInUseWithoutIntensity_NamesTheStep()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Lights = p.Lights with { StepInUse = 4 } };
        AssertProblem(p, "lights.stepInUse", "step 4 has no intensity");
    }

    [Fact]
    public void NonPositiveIntensity_NamesTheStep()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Lights = p.Lights with { IntensityCdByStep = new Dictionary<int, double> { [3] = 0, [5] = 10_000 } } };
        AssertProblem(p, "lights.intensityCdByStep.3", "expected a light intensity in candela > 0");
    }

    [Fact]
    public void InvalidTimeZone_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Aerodrome = p.Aerodrome with { TimeZone = "Mars/Olympus" } };
        AssertProblem(p, "aerodrome.timeZone", "'Mars/Olympus' is not a known time zone");
    }

    [Fact]
    public void IanaTimeZone_IsAccepted()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Aerodrome = p.Aerodrome with { TimeZone = "Europe/Lisbon" } };
        Assert.True(ProfileValidator.Validate(p).IsValid);
    }

    [Fact]
    public void LocationIndicatorNotFourLetters_NamesTheField()
    {
        var p = ProfileFixtures.Valid();
        p = p with { Aerodrome = p.Aerodrome with { Id = "xt1" } };
        AssertProblem(p, "aerodrome.id", "expected four capital letters");
    }

    [Fact]
    public void BlankVersion_NamesTheField()
    {
        AssertProblem(ProfileFixtures.Valid() with { Version = "" }, "version", "is blank");
    }

    [Fact]
    public void ConfirmRuleForATransitionR8DoesNotHave_NamesTheRule()
    {
        var p = ProfileFixtures.Valid() with { Confirm = [new TransitionRule(Phase.Preparation, Phase.Active), new TransitionRule(Phase.Active, Phase.Normal)] };
        AssertProblem(p, "confirm[1]", "active → normal is not a transition of docs/engine.md R8");
    }

    [Theory]
    [InlineData(Phase.Normal, Phase.Preparation)]
    [InlineData(Phase.Normal, Phase.Active)]
    [InlineData(Phase.Preparation, Phase.Active)]
    [InlineData(Phase.Preparation, Phase.Normal)]
    [InlineData(Phase.Active, Phase.Cancellation)]
    [InlineData(Phase.Cancellation, Phase.Active)]
    [InlineData(Phase.Cancellation, Phase.Normal)]
    [InlineData(Phase.Cancellation, Phase.Preparation)]
    public void ConfirmRuleForAnR8Transition_IsAccepted(Phase from, Phase to)
    {
        // normal -> active comes with preparation -> active (docs/engine.md R14)
        var p = ProfileFixtures.Valid() with { Confirm = [new TransitionRule(from, to), new TransitionRule(Phase.Preparation, Phase.Active)] };
        Assert.True(ProfileValidator.Validate(p with { Confirm = p.Confirm.Distinct().ToList() }).IsValid);
    }

    [Fact]
    public void DuplicateConfirmRule_NamesTheSecondOne()
    {
        var rule = new TransitionRule(Phase.Preparation, Phase.Active);
        AssertProblem(ProfileFixtures.Valid() with { Confirm = [rule, rule] }, "confirm[1]", "duplicate rule");
    }

    [Fact]
    public void NegativeFutureSkew_NamesTheField()
    {
        AssertProblem(ProfileFixtures.Valid() with { FutureSkewSeconds = -1 }, "futureSkewSeconds", "expected 0 or more");
    }

    [Fact]
    public void DuplicateGoverningPosition_NamesTheEntry()
    {
        var p = ProfileFixtures.Valid() with { GoverningPositions = [RvrPosition.Tdz, RvrPosition.Tdz] };
        AssertProblem(p, "governingPositions[1]", "duplicate position 'tdz'");
    }

    [Fact]
    public void SeveralProblems_AreAllListed()
    {
        var p = ProfileFixtures.Valid()
            .WithActive(a => a with { RvrRecoverM = 500, RecoverDwellSeconds = 0 })
            .WithSensor(2, s => s with { Runway = "nowhere" });
        var fields = ProfileValidator.Validate(p).Problems.Select(x => x.Field).ToList();
        Assert.Equal(["sensors[2].runway", "thresholds.active.rvrRecoverM", "thresholds.active.recoverDwellSeconds"], fields);
    }

    [Fact]
    public void ParseValidated_ThrowsListingEveryProblem()
    {
        var p = ProfileFixtures.Valid().WithActive(a => a with { RvrRecoverM = 500 }) with { FutureSkewSeconds = -2 };
        var ex = Assert.Throws<ProfileException>(() => ProfileValidator.ParseValidated(ProfileLoader.Serialize(p)));
        Assert.Equal(2, ex.Problems.Count);
        Assert.Equal("futureSkewSeconds", ex.Field);
        Assert.Contains("thresholds.active.rvrRecoverM", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void LoadValidated_OnMissingFile_ThrowsProfileException()
    {
        var ex = Assert.Throws<ProfileException>(() => ProfileValidator.LoadValidated(Path.Combine(Path.GetTempPath(), "no-such-profile-" + Guid.NewGuid() + ".json")));
        Assert.Equal("$", ex.Field);
        Assert.Contains("cannot read profile", ex.Message, StringComparison.Ordinal);
    }
}
