using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Readings;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R19–R22: a flagged value ("luminance unknown", "or more") is used as a value and the flag shows in
/// the status and in the transition's condition snapshot. Readings are invented.
/// </summary>
public sealed class ReadingFlagsTests
{
    private static ReadingInput Flagged(double seconds, string sensor, double metres, ReadingFlags flags) =>
        new(new Reading(At(seconds), sensor, ReadingKind.Rvr, metres, Flags: flags));

    [Fact]
    public void LuminanceUnknownRvr_EscalatesAsAValue_AndTheTransitionSaysSo()
    {
        var d = new EngineDriver();
        d.Run(0, Flagged(0, "RVR07T", 400, ReadingFlags.LuminanceUnknown), Rvr(0, "RVR07M", 1500), Rvr(0, "RVR25T", 1500), Ceiling(0, 5000));
        d.Run(40);
        var t = Assert.Single(d.Transitions);
        Assert.Equal((Phase.Normal, Phase.Active), (t.From, t.To));
        Assert.Equal(ReadingFlags.LuminanceUnknown, t.Snapshot.GoverningRvrFlags);
        Assert.Contains("\"governing_rvr_flags\":[\"luminance unknown\"]", EventJson.ToLine(t), StringComparison.Ordinal);
        var status = d.Engine.Describe(d.State, At(40));
        Assert.Equal(ReadingFlags.LuminanceUnknown, status.GoverningRvr!.Flags);
        Assert.Equal("luminance unknown", ReadingFlagText.Describe(status.GoverningRvr.Flags));
    }

    [Fact]
    public void UnflaggedTransition_WritesNoFlagsField()
    {
        var d = new EngineDriver();
        d.Weather(0, 400);
        d.Run(40);
        var t = Assert.Single(d.Transitions);
        Assert.Equal(ReadingFlags.None, t.Snapshot.GoverningRvrFlags);
        Assert.DoesNotContain("governing_rvr_flags", EventJson.ToLine(t), StringComparison.Ordinal);
    }

    [Fact]
    public void Rvr1500OrMore_SatisfiesRecoveryLikeAnyValueAtOrAboveRecover()
    {
        // docs/engine.md R22: the METAR "RVR 1500 m or more" reading is used as 1500 m (invented profile: recover 650 m
        // from active, 1100 m from preparation)
        var d = new EngineDriver();
        d.Weather(0, 400);
        d.Run(40);
        for (var t = 60.0; t <= 60 + 700; t += 60)
        {
            d.Run(t, [.. TestProfiles.GoverningRvr.Select(s => Flagged(t, s, 1500, ReadingFlags.OrMore)), Ceiling(t, 5000)]);
        }
        Assert.Contains(d.Transitions, t => t.From == Phase.Active && t.To == Phase.Cancellation && t.At == At(660));
        Assert.Equal("≥ ", ReadingFlagText.ValuePrefix(d.Engine.Describe(d.State, At(700)).GoverningRvr!.Flags));
    }
}
