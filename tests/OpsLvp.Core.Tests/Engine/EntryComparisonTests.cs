using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R18: entry per phase "below" (default) or "at or below"; recovery stays "at or above recover". Many
/// local instructions say "at or below 200 ft" (docs/sources.md "LVP phases": the comparison is a local choice); the
/// thresholds are the invented test profile's.
/// </summary>
public sealed class EntryComparisonTests
{
    private static AerodromeProfile AtOrBelow() => TestProfiles.Standard() with
    {
        Thresholds = TestProfiles.Standard().Thresholds with
        {
            Active = TestProfiles.Standard().Thresholds.Active with { EntryComparison = EntryComparison.AtOrBelow },
        },
    };

    [Fact]
    public void CeilingExactlyAtTheActiveThreshold_WithAtOrBelow_EntersActive()
    {
        // METAR BKN002 = 200 ft (WMO-No. 306 FM 15, hundreds of feet): at the 200 ft threshold, a whole 100 ft step
        var d = new EngineDriver(AtOrBelow());
        d.Weather(0, 1500, ceilingFt: 200);
        d.Run(40);
        var t = Assert.Single(d.Transitions);
        Assert.Equal((Phase.Normal, Phase.Active), (t.From, t.To));
        Assert.Equal(At(30), t.At);
        Assert.Equal("ceiling 200 ft (CEIL1) <= 200 ft", t.Reason);
    }

    [Fact]
    public void CeilingExactlyAtTheActiveThreshold_WithTheDefaultBelow_OnlyPreparation()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500, ceilingFt: 200);
        d.Run(40);
        var t = Assert.Single(d.Transitions);
        Assert.Equal((Phase.Normal, Phase.Preparation), (t.From, t.To));
        Assert.Equal("ceiling 200 ft (CEIL1) < 300 ft", t.Reason);
    }

    [Fact]
    public void RvrExactlyAtTheActiveThreshold_WithAtOrBelow_EntersActive()
    {
        var d = new EngineDriver(AtOrBelow());
        d.Weather(0, 550);
        d.Run(40);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
        Assert.Equal("RVR 07 TDZ 550 m <= 550 m", Assert.Single(d.Transitions).Reason);
    }

    [Fact]
    public void Recovery_StaysAtOrAboveRecover_WithAtOrBelowEntry()
    {
        var d = new EngineDriver(AtOrBelow());
        d.Weather(0, 1500, ceilingFt: 200);
        d.Run(40);
        // 250 ft = active.ceilingRecoverFt: recovery is inclusive (≥), cancellation after the 10-minute recover dwell
        d.WeatherFromTo(60, 60 + 660, 1500, ceilingFt: 250);
        Assert.Contains(d.Transitions, t => t.From == Phase.Active && t.To == Phase.Cancellation && t.At == At(660));
    }
}
