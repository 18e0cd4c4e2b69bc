using CsCheck;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Profile;
using static OpsLvp.Core.Tests.Capability.CapabilityTestProfiles;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>
/// Property tests (CsCheck) of docs/engine.md R31–R33 over random invented inputs: facility statuses, RVR per position
/// around the invented minima (or silent / out of service / observer), and the LVP standing.
/// </summary>
public class CapabilityPropertyTests
{
    private static readonly string[] FacilityIds = ["ils-07", "als-07", "cl-07", "tdzl-07", "sb-07", "power", "rvr-07t"];

    private static readonly Gen<FacilityStatus?> StatusGen = Gen.OneOf<FacilityStatus?>(null, null, FacilityStatus.Serviceable, FacilityStatus.Degraded, FacilityStatus.Unserviceable);

    private static Gen<PositionValue> PositionGen(string direction, RvrPosition position) =>
        Gen.Select(Gen.Int[0, 5], Gen.OneOf(74.0, 75, 124, 125, 149, 150, 174, 175, 299, 300, 549, 550, 2000), (kind, value) => kind switch
        {
            0 => new PositionValue(direction, position, null, RvrSource.Sensor, PositionGap.Silent),
            1 => new PositionValue(direction, position, null, RvrSource.Sensor, PositionGap.OutOfService),
            2 => new PositionValue(direction, position, value, RvrSource.Observer, PositionGap.Silent, "obs (invented)"),
            _ => new PositionValue(direction, position, value, RvrSource.Sensor, null),
        });

    private static readonly Gen<CapabilityInputs> InputsGen =
        Gen.Select(
            StatusGen.Array[FacilityIds.Length],
            PositionGen("07", RvrPosition.Tdz), PositionGen("07", RvrPosition.Mid), PositionGen("07", RvrPosition.End),
            Gen.OneOf(LvpStanding.NotInForce, LvpStanding.SafeguardsIncomplete, LvpStanding.InForce),
            (statuses, tdz, mid, end, lvp) =>
            {
                var facilities = new Dictionary<string, FacilityState>();
                for (var i = 0; i < FacilityIds.Length; i++)
                {
                    if (statuses[i] is { } s)
                    {
                        facilities[FacilityIds[i]] = Status(s);
                    }
                }
                return Inputs([tdz, mid, end], lvp, facilities);
            });

    [Fact]
    public void NeverBetterThanItsInputsAllow()
    {
        var profile = Runway07();
        InputsGen.Sample(inputs =>
        {
            foreach (var direction in CapabilityEvaluator.Evaluate(profile, inputs))
            {
                foreach (var (op, config) in direction.Operations.Zip(profile.Operations.Where(o => o.Direction == direction.Direction)))
                {
                    if (!op.Available)
                    {
                        continue;
                    }
                    // every facility serviceable (or degraded where accepted), LVP in force where needed, every RVR at or above its minimum
                    foreach (var id in config.Facilities)
                    {
                        if (inputs.Facilities.TryGetValue(id, out var state))
                        {
                            Assert.NotEqual(FacilityStatus.Unserviceable, state.Status);
                            Assert.True(state.Status != FacilityStatus.Degraded || (config.AcceptDegraded ?? []).Contains(id));
                        }
                    }
                    Assert.True(!config.NeedsLvp || inputs.Lvp == LvpStanding.InForce);
                    foreach (var need in config.Rvr)
                    {
                        var at = inputs.Positions.Single(p => p.Direction == direction.Direction && p.Position == need.Position);
                        Assert.True(at.ValueM >= need.MinimumM);
                    }
                }
                var best = direction.Operations.Where(o => o.Available && o.Kind != OperationKind.Lvto).Select(o => CapabilityEvaluator.ApproachRank(o.Kind)).DefaultIfEmpty(0).Max();
                Assert.Equal(best, CapabilityEvaluator.ApproachRank(direction.BestApproach));
                Assert.Equal(direction.Operations.Any(o => o.Kind == OperationKind.Lvto && o.Available), direction.LvtoAvailable);
            }
        }, iter: 2000);
    }

    [Fact]
    public void ASilentRequiredPosition_NeverLeavesAnOperationAvailable()
    {
        var profile = Runway07();
        InputsGen.Sample(inputs =>
        {
            var silent = inputs.Positions.Where(p => p.ValueM is null).Select(p => p.Position).ToHashSet();
            foreach (var (op, config) in CapabilityEvaluator.Evaluate(profile, inputs).Single(d => d.Direction == "07").Operations
                .Zip(profile.Operations.Where(o => o.Direction == "07")))
            {
                if (config.Rvr.Any(r => silent.Contains(r.Position)))
                {
                    Assert.False(op.Available);
                    Assert.Contains(op.Reasons, r => r.Kind is ReasonKind.RvrPositionSilent or ReasonKind.RvrPositionOutOfService);
                }
            }
        }, iter: 2000);
    }

    [Fact]
    public void AnUnavailableOperation_AlwaysHasAReason_AndAnAvailableOneNone()
    {
        var profile = Runway07();
        InputsGen.Sample(inputs =>
        {
            foreach (var op in CapabilityEvaluator.Evaluate(profile, inputs).SelectMany(d => d.Operations))
            {
                Assert.Equal(op.Available, op.Reasons.Count == 0);
            }
        }, iter: 1000);
    }
}
