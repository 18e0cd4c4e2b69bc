using OpsLvp.Core.Capability;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>docs/engine.md R30: the capability section is checked with the rest of the profile; each problem names its field.</summary>
public class CapabilityValidatorTests
{
    private static AerodromeProfile With(CapabilityProfile capability)
    {
        var standard = TestProfiles.Standard();
        // the engine tests' profile leaves out the raw kinds' maximum age; the validator wants it (invented value)
        var maxAges = new Dictionary<OpsLvp.Core.Readings.ReadingKind, int>(standard.MaxAgeSeconds) { [OpsLvp.Core.Readings.ReadingKind.Extinction] = 120 };
        return standard with { Capability = capability, MaxAgeSeconds = maxAges };
    }

    private static IReadOnlyList<ValidationProblem> Problems(CapabilityProfile capability) => ProfileValidator.Validate(With(capability)).Problems;

    [Fact]
    public void TheTestSection_IsValid()
    {
        Assert.Empty(Problems(CapabilityTestProfiles.Runway07()));
    }

    [Fact]
    public void BadFacilities_AreNamedByField()
    {
        var c = CapabilityTestProfiles.Runway07() with
        {
            ObserverRvrMaxAgeSeconds = 0,
            Facilities =
            [
                new FacilityConfig("ils-07", "ILS 07", FacilityKind.Ils, ["07"], "airside"),
                new FacilityConfig("ils-07", " ", FacilityKind.StandbyPower, ["99"], "nobody"),
                new FacilityConfig("s", "Sensor", FacilityKind.RvrSensor, ["07"], "airside", Sensor: "NOPE"),
            ],
        };

        var fields = Problems(c).Select(p => p.Field).ToList();

        Assert.Contains("capability.observerRvrMaxAgeSeconds", fields);
        Assert.Contains("capability.facilities[0].ilsCategory", fields);
        Assert.Contains("capability.facilities[1].id", fields);
        Assert.Contains("capability.facilities[1].name", fields);
        Assert.Contains("capability.facilities[1].directions", fields);
        Assert.Contains("capability.facilities[1].team", fields);
        Assert.Contains("capability.facilities[1].switchOverSeconds", fields);
        Assert.Contains("capability.facilities[2].sensor", fields);
    }

    [Fact]
    public void BadOperations_AreNamedByField()
    {
        var c = CapabilityTestProfiles.Runway07() with
        {
            Operations =
            [
                new OperationConfig("99", OperationKind.CatI, ["ghost"], [new(RvrPosition.Tdz, 0)], NeedsLvp: false),
                new OperationConfig("07", OperationKind.CatII, ["ils-07"], [new(RvrPosition.Tdz, 2500), new(RvrPosition.Tdz, 300)], NeedsLvp: false, AcceptDegraded: ["power"]),
                new OperationConfig("07", OperationKind.CatII, [], [], NeedsLvp: true),
            ],
        };

        var problems = Problems(c);
        var fields = problems.Select(p => p.Field).ToList();

        Assert.Contains("capability.operations[0].direction", fields);
        Assert.Contains("capability.operations[0].facilities", fields);
        Assert.Contains("capability.operations[0].rvr[0].minimumM", fields);
        Assert.Contains("capability.operations[1].rvr[0].minimumM", fields); // above 2000 m, the highest reportable RVR
        Assert.Contains("capability.operations[1].rvr[1].position", fields);
        Assert.Contains("capability.operations[1].acceptDegraded", fields);
        Assert.Contains("capability.operations[1].needsLvp", fields);
        Assert.Contains("capability.operations[2].kind", fields);
    }

    [Fact]
    public void TheSection_RoundTripsThroughProfileJson()
    {
        var profile = With(CapabilityTestProfiles.Runway07());
        var json = ProfileLoader.Serialize(profile);
        var back = ProfileValidator.ParseValidated(json);

        Assert.Contains("\"catIII\"", json, StringComparison.Ordinal);
        Assert.Equal(profile.Capability!.Facilities, back.Capability!.Facilities.Select(f => f with { Directions = profile.Capability.Facilities.Single(x => x.Id == f.Id).Directions }));
        Assert.Equal(profile.Capability.Operations.Count, back.Capability.Operations.Count);
        Assert.Equal(CapabilityTestProfiles.CatIIITdzM, back.Capability.Operations[2].Rvr[0].MinimumM);
    }
}
